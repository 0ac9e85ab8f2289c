/**
 * Benchmark of the scrap report: seeds 5,000 lots and 200,000 units (each received, torn down
 * and judged; a share scrapped with a reason and teardown minutes) into a throwaway file under
 * bench/, then times the report beside its bare SQL. Run: npm run bench:reports
 */
import { rmSync } from 'node:fs';
import { randomUUID } from 'node:crypto';
import { openDatabase } from '../src/lib/server/db/index';
import { DEMO_SCRAP_REASONS, DEMO_STATIONS, rng } from '../src/lib/server/seed';
import { scrapReport } from '../src/lib/server/reports/scrap';
import { setLabourRateCents } from '../src/lib/server/reports/settings';

const FILE = 'bench/bench-reports.db';
const LOTS = 5_000;
const UNITS = 200_000;
for (const f of [FILE, `${FILE}-wal`, `${FILE}-shm`]) rmSync(f, { force: true });
const db = openDatabase(FILE);
const c = db.$client;
const random = rng(7);

const t0 = performance.now();
const userId = randomUUID();
c.transaction(() => {
	c.prepare(`insert into user (id, email, name, role, password_hash) values (?, 'bench@shop.test', 'Bench', 'owner', 'x')`).run(userId);
	DEMO_STATIONS.forEach((s, i) => c.prepare(`insert into station (code, name, stage, material, overdue_hours, sort_order) values (?, ?, ?, ?, ?, ?)`).run(s.code, s.name, s.stage, s.material ?? null, s.overdueHours, i));
	for (const r of DEMO_SCRAP_REASONS) c.prepare(`insert into scrap_reason (code, label, category) values (?, ?, ?)`).run(r.code, r.label, r.category);
	for (let i = 0; i < 3; i++) c.prepare(`insert into supplier (name) values (?)`).run(`Bench source ${i}`);
	for (let i = 0; i < 8; i++) c.prepare(`insert into turbo_model (code, family) values (?, 'F')`).run(`BM-${i}`);
	const lot = c.prepare(`insert into core_lot (code, source, supplier_id, received_on, cost_per_core_cents, expected_count, created_at) values (?, 'purchased_skid', ?, ?, ?, 40, ?)`);
	const day = 86_400_000;
	const start = Date.UTC(2024, 0, 1);
	for (let l = 1; l <= LOTS; l++) {
		const at = start + Math.floor((l / LOTS) * 700) * day;
		lot.run(`B${String(l).padStart(5, '0')}`, 1 + (l % 3), new Date(at).toISOString().slice(0, 10), 2500 + (l % 3) * 2000, at);
	}
	const u = c.prepare(`insert into unit (serial, lot_id, model_id, state, version, state_since, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, ?)`);
	const e = c.prepare(`insert into unit_event (unit_id, seq, from_state, to_state, action, station_id, user_id, at, idempotency_key, data) values (?, ?, ?, ?, ?, 1, ?, ?, ?, ?)`);
	for (let n = 1; n <= UNITS; n++) {
		const lotId = 1 + ((n - 1) % LOTS);
		const at = start + Math.floor((lotId / LOTS) * 700) * day;
		const scrapP = [0.22, 0.42, 0.1][lotId % 3];
		const r = random();
		const state = r < 0.08 ? 'received' : r < 0.1 ? 'inspected' : random() < scrapP ? 'scrapped' : 'accepted';
		const steps = state === 'received' ? 1 : state === 'inspected' ? 2 : 3;
		const id = Number(u.run(`SY-${String(n).padStart(6, '0')}`, lotId, 1 + (n % 8), state, steps, at, at, at).lastInsertRowid);
		e.run(id, 1, null, 'received', 'receive', userId, at, `b:${n}:1`, null);
		if (steps >= 2) e.run(id, 2, 'received', 'inspected', 'inspect', userId, at + 3_600_000, `b:${n}:2`, JSON.stringify({ labourMinutes: 20 + (n % 30) }));
		if (steps === 3) {
			const data = state === 'scrapped' ? { reasonCode: DEMO_SCRAP_REASONS[n % 8].code, labourMinutes: 10 } : null;
			e.run(id, 3, 'inspected', state, state === 'scrapped' ? 'scrap' : 'accept', userId, at + 7_200_000, `b:${n}:3`, data ? JSON.stringify(data) : null);
		}
	}
	setLabourRateCents(db, 6500);
})();
c.pragma('optimize');
const seeded = performance.now() - t0;
const events = (c.prepare('select count(*) n from unit_event').get() as { n: number }).n;
console.log(`Seeded ${LOTS} lots, ${UNITS} units, ${events} events in ${(seeded / 1000).toFixed(1)} s → ${FILE}`);

function time(label: string, fn: () => unknown, runs = 9): number {
	fn(); // warm the cache
	const ms: number[] = [];
	for (let i = 0; i < runs; i++) {
		const s = performance.now();
		fn();
		ms.push(performance.now() - s);
	}
	ms.sort((a, b) => a - b);
	const median = ms[Math.floor(ms.length / 2)];
	console.log(`${label.padEnd(44)} median ${median.toFixed(1)} ms (min ${ms[0].toFixed(1)}, max ${ms[ms.length - 1].toFixed(1)}, ${runs} runs)`);
	return median;
}

// The report's own SQL, run bare (no Drizzle mapping, no statistics): per lot, per model, reasons.
const bare = [
	c.prepare(`select l.id, l.code, l.received_on, l.source, l.supplier_id, s.name, l.cost_per_core_cents,
		coalesce(sum(t.received), 0), coalesce(sum(t.waiting), 0), coalesce(sum(t.scrapped), 0), coalesce(sum(t.scrap_labour_minutes), 0)
		from core_lot l left join supplier s on s.id = l.supplier_id left join lot_tally t on t.lot_id = l.id
		group by l.id order by l.received_on, l.id`),
	c.prepare(`select t.model_id, sum(t.received - t.waiting), sum(t.scrapped), sum(t.scrapped * l.cost_per_core_cents), sum(t.scrap_labour_minutes)
		from lot_tally t join core_lot l on l.id = t.lot_id group by t.model_id`),
	c.prepare(`select r.lot_id, r.reason_code, sum(r.units) from lot_scrap_reason_tally r join core_lot l on l.id = r.lot_id
		where r.units > 0 group by r.lot_id, r.reason_code`)
];
// What the tallies replace: the same counts recomputed from the units and their history.
const fromHistory = [
	c.prepare(`select lot_id, model_id, count(*), sum(state in ('received', 'inspected')), sum(state = 'scrapped') from unit group by lot_id, model_id`),
	c.prepare(`select u.lot_id, u.model_id, sum(case when json_type(e.data, '$.labourMinutes') in ('integer', 'real') and json_extract(e.data, '$.labourMinutes') > 0 then json_extract(e.data, '$.labourMinutes') else 0 end)
		from unit_event e join unit u on u.id = e.unit_id where e.action in ('inspect', 'accept', 'scrap') and u.state = 'scrapped' group by u.lot_id, u.model_id`),
	c.prepare(`select u.lot_id, coalesce(json_extract(e.data, '$.reasonCode'), '(none)') code, count(*)
		from (select unit_id, max(id) id from unit_event where action = 'scrap' group by unit_id) last
		join unit_event e on e.id = last.id join unit u on u.id = last.unit_id where u.state = 'scrapped' group by u.lot_id, code`)
];
const report = time('scrap report (all lots, every aggregate)', () => scrapReport(db, {}));
time('scrap report, one supplier', () => scrapReport(db, { supplier: 2 }));
time('scrap report, one model and a quarter', () => scrapReport(db, { model: 'BM-3', from: '2024-04-01', to: '2024-06-30' }));
time("bare SQL: the report's three queries", () => bare.forEach((q) => q.all()));
time('for comparison: the same counts from the history', () => fromHistory.forEach((q) => q.all()), 3);
console.log(report < 150 ? `OK: under the 150 ms target.` : `SLOW: above the 150 ms target.`);
c.close();
