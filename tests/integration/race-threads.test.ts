/**
 * Moves the database must settle: four worker threads, each with its own connection to one
 * database file, released together by a barrier each round, move the same few units through the
 * real services (`applyMove`, `undoLastMove`). Every move pauses a few milliseconds after it read
 * the unit (SPOOLYARD_TEST_MOVE_STALL_MS, set only for the threads), so the racers are inside a
 * move at the same time and only the immediate transaction and the version checks keep them
 * apart. Every outcome is accounted for (tests/helpers/race-rounds.ts) and every unit's row
 * equals the fold of its history at the end.
 *
 * RACE_THREAD_ROUNDS (default 200) and RACE_SEED replay a run.
 */
import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { Worker } from 'node:worker_threads';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { unit, unitEvent, user } from '../../src/lib/server/db/schema';
import { applyMove } from '../../src/lib/server/units';
import { DEMO_STATIONS } from '../../src/lib/server/seed';
import { STAGES, type Stage } from '../../src/lib/domain/units/states';
import { testShop, type TestShop } from '../helpers/db';
import { checkUnits } from '../helpers/shop-prep';
import { rng } from '../helpers/machine-moves';
import { emptyTally, planRound, roundProblems, tidyPool, type RaceOutcome, type RacePeople } from '../helpers/race-rounds';

const RACERS = 4;
const ROUNDS = Number(process.env.RACE_THREAD_ROUNDS ?? 200);
const SEED = Number(process.env.RACE_SEED ?? Math.floor(Math.random() * 2 ** 31));
const STALL_MS = 4;

let dir: string;
let shop: TestShop;
let people: RacePeople;
const workers: Worker[] = [];
const inbox: ((o: RaceOutcome) => void)[][] = [];

beforeAll(async () => {
	dir = mkdtempSync(join(tmpdir(), 'spoolyard-race-'));
	const file = join(dir, 'shop.db');
	shop = testShop(file);
	const tech2 = { id: randomUUID(), role: 'tech' as const };
	shop.db.insert(user).values({ id: tech2.id, email: 'tech2@shop.test', name: 'Second tech', role: 'tech', passwordHash: 'x' }).run();
	const a = shop.actors;
	people = {
		techs: [a.tech, tech2],
		lead: a.lead,
		owner: a.owner,
		office: a.office,
		names: new Map([
			[a.tech.id, 'tech'],
			[tech2.id, 'tech2'],
			[a.lead.id, 'lead'],
			[a.owner.id, 'owner'],
			[a.office.id, 'office']
		])
	};
	const barrier = new SharedArrayBuffer(8);
	const boot = resolve(import.meta.dirname, '../helpers/ts-worker.mjs');
	const entry = resolve(import.meta.dirname, '../helpers/race-worker.ts');
	await Promise.all(
		Array.from({ length: RACERS }, (_, i) => {
			const w = new Worker(boot, {
				workerData: { entry, file, barrier, parties: RACERS },
				env: { ...process.env, SPOOLYARD_TEST_MOVE_STALL_MS: String(STALL_MS) }
			});
			workers.push(w);
			inbox.push([]);
			return new Promise<void>((ready, fail) => {
				w.once('error', fail);
				w.on('message', (m: RaceOutcome | { ready: true }) => ('ready' in m ? ready() : inbox[i].shift()?.(m)));
			});
		})
	);
}, 60_000);

afterAll(async () => {
	await Promise.all(
		workers.map((w) => {
			const gone = new Promise((r) => w.once('exit', r));
			w.postMessage({ stop: true });
			return gone;
		})
	);
	shop?.db.$client.close();
	if (dir) rmSync(dir, { recursive: true, force: true });
});

test(`${RACERS} threads race on shared units for ${ROUNDS} rounds: every outcome accounted for, rows equal the fold of their histories`, async () => {
	const stations = Object.fromEntries(STAGES.map((s) => [s, DEMO_STATIONS.filter((d) => d.stage === s).map((d) => d.code)])) as Record<Stage, string[]>;
	const random = rng(SEED);
	const pool = shop.receive(2);
	const every = new Set(pool);
	const tally = emptyTally();
	let problems: string[] = [];
	const started = performance.now();
	for (let round = 0; round < ROUNDS && problems.length === 0; round++) {
		const { jobs, snapshots } = planRound(shop.db, round, pool, RACERS, people, stations, random);
		const outcomes = await Promise.all(
			jobs.map(
				(job, i) =>
					new Promise<RaceOutcome>((answer) => {
						inbox[i].push(answer);
						workers[i].postMessage({ job });
					})
			)
		);
		problems = roundProblems(shop.db, snapshots, jobs, outcomes, tally, STALL_MS * 1.8).map((p) => `round ${round}: ${p}`);
		tidyPool(shop.db, pool, people, tally, () => {
			const [serial] = shop.receive(1);
			every.add(serial);
			return serial;
		});
	}
	const ms = performance.now() - started;
	console.log(`race (threads, seed ${SEED}): ${tally.rounds} rounds in ${Math.round(ms)} ms; ${JSON.stringify(tally)}`);
	expect(problems, `seed ${SEED}`).toEqual([]);

	const checked = checkUnits(shop.db, [...every]);
	expect(checked).toHaveLength(every.size);
	expect(checked.filter((u) => u.problem !== null).map((u) => `${u.serial}: ${u.problem}`)).toEqual([]);

	// the race was real: racers met on one unit, waited for each other's transactions, lost on the version and on the route
	expect(tally.rounds).toBe(ROUNDS);
	expect(tally.contended).toBeGreaterThan(tally.jobs / 2);
	expect(tally.waited).toBeGreaterThan(ROUNDS / 2);
	expect(tally.versionConflicts).toBeGreaterThan(ROUNDS / 10);
	expect(tally.refusedAfterAnotherWon).toBeGreaterThan(ROUNDS / 20);
	expect(tally.wins).toBeGreaterThan(ROUNDS);
	expect(tally.finished.shipped + tally.finished.scrapped).toBeGreaterThan(0);
}, 120_000);

test('the update compares the version it read: a write that lands between reading the unit and updating it stops the move', () => {
	// Inside the immediate transaction no other connection can write the row; this writes it from
	// inside the move (its `before` hook) to stand for a writer the lock did not keep out, as a
	// database without the write lock would let in. The move must fail whole, not overwrite it.
	const s = testShop();
	const [serial] = s.receive();
	const before = s.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	const intruder = () => void s.db.update(unit).set({ version: before.version + 1, holdReason: 'written meanwhile' }).where(eq(unit.id, before.id)).run();
	expect(() =>
		applyMove(s.db, s.actors.lead, { serial, action: 'inspect', idempotencyKey: 'cas-inspect-1' }, new Date(), { before: intruder })
	).toThrow(`lost update on ${serial}`);
	const after = s.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	expect({ state: after.state, version: after.version, holdReason: after.holdReason }).toEqual({ state: 'received', version: 1, holdReason: null });
	expect(s.db.select().from(unitEvent).where(eq(unitEvent.unitId, before.id)).all().map((e) => e.action)).toEqual(['receive']);
	s.db.$client.close();
});
