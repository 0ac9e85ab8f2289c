/**
 * Where a request's time goes, without HTTP: opens a copy of the benchmark database in this
 * process, times station boards, the scrap report and a run of moves, and splits each into the time spent in
 * SQLite statements (by statement) and the rest (query building, mapping, the state machine).
 *
 *   npm run bench:profile                run `npm run bench` first: it seeds bench/bench.db
 *   BENCH_DB=other.db npm run bench:profile
 */
import { copyFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { stationBoard } from '../src/lib/server/board';
import { openDatabase } from '../src/lib/server/db/index';
import { scrapReport } from '../src/lib/server/reports/scrap';
import { applyMove } from '../src/lib/server/units';


const SOURCE = process.env.BENCH_DB ?? 'bench/bench.db';
if (!existsSync(SOURCE)) {
	console.error(`No ${SOURCE}: run \`npm run bench\` first (it seeds the database).`);
	process.exit(1);
}
const file = join(tmpdir(), `spoolyard-profile-${process.pid}.db`);
copyFileSync(SOURCE, file);
const db = openDatabase(file);

// Time every statement run through this connection, keyed by the start of its SQL.
const times = new Map<string, number>();
const client = db.$client as unknown as { prepare(sql: string): Record<string, (...a: unknown[]) => unknown> };
const prepare = client.prepare.bind(client);
client.prepare = (sqlText: string) => {
	const st = prepare(sqlText);
	for (const m of ['all', 'get', 'run'] as const) {
		const f = st[m].bind(st);
		st[m] = (...a: unknown[]) => {
			const t = performance.now();
			try {
				return f(...a);
			} finally {
				const key = sqlText.replace(/\s+/g, ' ').slice(0, 96);
				times.set(key, (times.get(key) ?? 0) + performance.now() - t);
			}
		};
	}
	return st;
};

function report(title: string, n: number, total: number) {
	const rows = [...times].sort((a, b) => b[1] - a[1]);
	const sqlMs = rows.reduce((s, [, v]) => s + v, 0) / n;
	console.log(`\n${title}: ${(total / n).toFixed(3)} ms each (SQL ${sqlMs.toFixed(3)} ms, the rest ${(total / n - sqlMs).toFixed(3)} ms)`);
	for (const [k, v] of rows.slice(0, 8)) console.log(`  ${(v / n).toFixed(3).padStart(7)} ms  ${k}`);
	times.clear();
}

for (const code of ['TEARDOWN-1', 'WASH', 'BUILD-1']) {
	for (let i = 0; i < 20; i++) stationBoard(db, code);
	times.clear();
	const n = 200;
	const t0 = performance.now();
	for (let i = 0; i < n; i++) stationBoard(db, code);
	report(`Station board ${code}`, n, performance.now() - t0);
}

{
	scrapReport(db, {});
	times.clear();
	const n = 10;
	const t0 = performance.now();
	let out = '';
	for (let i = 0; i < n; i++) out = JSON.stringify(scrapReport(db, {}));
	report(`Scrap report (all lots; ${(out.length / 1024).toFixed(0)} kB of JSON)`, n, performance.now() - t0);
}

const tech = db.$client.prepare(`select id, role from user where role = 'tech' and active = 1 limit 1`).get() as { id: string; role: 'tech' };
const pool = db.$client.prepare(`select serial, state from unit where state = 'painted' and held = 0 limit 1500`).all() as { serial: string }[];
let key = 0;
let refused = 0;
const move = (serial: string, hold: boolean) => {
	const r = applyMove(db, tech, {
		serial,
		action: hold ? 'hold' : 'release',
		stationCode: 'BUILD-1',
		idempotencyKey: `profile-${process.pid}-${key++}`,
		...(hold ? { data: { reason: 'Waiting for a wheel' } } : {})
	});
	if (!r.ok) refused++;
};
for (const u of pool.slice(0, 100)) move(u.serial, true);
for (const u of pool.slice(0, 100)) move(u.serial, false);
times.clear();
const t0 = performance.now();
for (let round = 0; round < 4; round++) for (const u of pool) move(u.serial, round % 2 === 0);
report(`Move (hold / release at BUILD-1, ${refused} refused)`, pool.length * 4, performance.now() - t0);

db.$client.close();
for (const f of [file, `${file}-wal`, `${file}-shm`]) rmSync(f, { force: true });
