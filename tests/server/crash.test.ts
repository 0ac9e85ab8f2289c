/**
 * kill -9 under load: several clients drive scans at the built server while it is killed at
 * random moments CRASH_ROUNDS times (default 10) and restarted. Every scan the server
 * acknowledged must be in the database exactly once, every unit's row must equal the fold of
 * its history, and `PRAGMA integrity_check` must say ok after every crash.
 *
 * The kill delays come from CRASH_SEED (printed at the start; a random one when unset):
 * `CRASH_SEED=1234 npx vitest run tests/server/crash.test.ts` repeats the same delays. The
 * clients' interleaving is the operating system's, so a seed replays the delays, not every
 * request. A wait that runs out fails the test.
 */
import fc from 'fast-check';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { setTimeout as sleep } from 'node:timers/promises';
import { openDatabase } from '../../src/lib/server/db/index';
import { checkUnits, prepareUnits } from '../helpers/shop-prep';
import { Client, cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const PORT = 4265;
const CRASHES = Number(process.env.CRASH_ROUNDS ?? 10);
const SEED = process.env.CRASH_SEED ? Number(process.env.CRASH_SEED) : Math.floor(Math.random() * 2 ** 31);
/** How long the clients may take to get back to work on a restarted server. */
const RESUME_MS = 15_000;
const CLIENTS = 4;
const STEPS: [string, string][] = [
	['inspect', 'TEARDOWN-1'],
	['accept', 'TEARDOWN-1'],
	['clean', 'WASH']
];

let server: RunningServer;
let dir: string;
let file: string;
let serials: string[];

beforeAll(async () => {
	await ensureBuilt();
	({ dir, file } = await freshDemoDb());
	serials = prepareUnits(file, 1500);
	server = await startServer(file, PORT);
}, 300_000);

afterAll(async () => {
	await server?.stop();
	if (dir) cleanup(dir);
});

interface Ack {
	key: string;
	serial: string;
	status: number;
}

test(`${CRASHES} kill -9 crashes under load: no acknowledged scan lost or doubled`, async () => {
	const who = ['tech', 'tech2', 'lead', 'owner'] as const;
	const clients: Client[] = [];
	for (let i = 0; i < CLIENTS; i++) clients.push(await signedIn(server.origin, who[i]));
	const acked: Ack[] = [];
	let stop = false;
	let transportErrors = 0;
	// each client owns every CLIENTS-th unit and walks them through the steps, one request at a time
	const work = clients.map(async (c, ci) => {
		const mine = serials.filter((_, i) => i % CLIENTS === ci);
		for (const serial of mine) {
			for (const [action, stationCode] of STEPS) {
				const key = `crash-${serial}-${action}`;
				for (;;) {
					if (stop) return;
					try {
						const r = await c.postJson(`/api/units/${serial}/events`, { action, stationCode, idempotencyKey: key }, { origin: c.origin });
						if (r.status === 201 || r.status === 200) {
							acked.push({ key, serial, status: r.status });
							break;
						}
						throw new Error(`unexpected ${r.status} for ${key}: ${r.text.slice(0, 200)}`);
					} catch (e) {
						if (String(e).includes('unexpected')) throw e;
						transportErrors++; // the server is down: retry the same key until it is back
						await sleep(20);
					}
				}
			}
		}
	});
	const failed = Promise.all(work).catch((e) => e as Error);

	expect(Number.isSafeInteger(SEED), `CRASH_SEED must be an integer, got ${process.env.CRASH_SEED}`).toBe(true);
	console.log(`crash: CRASH_SEED=${SEED} (set it to replay these kill delays)`);
	const rng = fc.sample(fc.integer({ min: 150, max: 1200 }), { numRuns: CRASHES, seed: SEED });
	const perCrash: number[] = [];
	for (let crash = 0; crash < CRASHES; crash++) {
		// wait until the clients are back at work on this server, then kill it at a random moment
		const resumed = acked.length;
		await expect
			.poll(() => acked.length, { timeout: RESUME_MS, interval: 10, message: `clients back at work before crash ${crash + 1} (CRASH_SEED=${SEED})` })
			.toBeGreaterThanOrEqual(resumed + CLIENTS);
		const before = acked.length;
		await sleep(rng[crash]);
		await server.kill9();
		perCrash.push(acked.length - before);
		// the server is dead: everything it acknowledged must be on disk
		const ackedNow = acked.slice();
		const db = openDatabase(file, { migrate: false });
		try {
			expect(db.$client.pragma('integrity_check', { simple: true })).toBe('ok');
			const keyCount = db.$client.prepare(`select count(*) from unit_event where idempotency_key = ?`).pluck();
			for (const a of ackedNow) expect(keyCount.get(a.key), `acknowledged ${a.key} after crash ${crash + 1}`).toBe(1);
			const dupes = db.$client
				.prepare(
					`select count(*) from (select e.unit_id, e.action from unit_event e join unit u on u.id = e.unit_id
					 where u.id >= (select id from unit where serial = ?) and e.action != 'receive'
					 group by e.unit_id, e.action having count(*) > 1)`
				)
				.pluck()
				.get(serials[0]);
			expect(dupes, 'a move recorded twice').toBe(0);
		} finally {
			db.$client.close();
		}
		server = await startServer(file, PORT);
	}
	// a little more work after the last restart, then stop the clients
	await sleep(300);
	stop = true;
	const err = await failed;
	if (err instanceof Error) throw err;
	for (const c of clients) c.close();
	await server.stop();

	const db = openDatabase(file, { migrate: false });
	try {
		expect(db.$client.pragma('integrity_check', { simple: true })).toBe('ok');
		const checked = checkUnits(db, serials);
		for (const u of checked) expect(u.problem, u.serial).toBeNull();
		const keys = new Set(checked.flatMap((u) => u.events.map((e) => e.idempotencyKey)));
		const lost = acked.filter((a) => !keys.has(a.key));
		expect(lost).toEqual([]);
		const replayed = acked.filter((a) => a.status === 200).length;
		console.log(
			`crash: ${CRASHES} kill -9 survived; ${acked.length} scans acknowledged (${replayed} of them retries answered from the first result), ` +
				`lost 0; acknowledged between crashes ${JSON.stringify(perCrash)}; ${transportErrors} retries while down`
		);
		expect(acked.length).toBeGreaterThan(CRASHES * 5);
	} finally {
		db.$client.close();
	}
}, 600_000);
