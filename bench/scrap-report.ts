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

const bare = c.prepare(`select l.id, count(u.id), sum(case when u.state in ('received','inspected') then 1 else 0 end), sum(case when u.state = 'scrapped' then 1 else 0 end)
	from core_lot l left join unit u on u.lot_id = l.id group by l.id order by l.received_on, l.id`);
const report = time('scrap report (all lots, every aggregate)', () => scrapReport(db, {}));
time('scrap report, one supplier', () => scrapReport(db, { supplier: 2 }));
time('scrap report, one model and a quarter', () => scrapReport(db, { model: 'BM-3', from: '2024-04-01', to: '2024-06-30' }));
time('bare SQL: per-lot counts only', () => bare.all());
console.log(report < 150 ? `OK: under the 150 ms target.` : `SLOW: above the 150 ms target.`);
c.close();
