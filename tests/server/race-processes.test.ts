/**
 * Moves the database must settle, through the built app: three server processes on ONE database
 * file, each with its own connection, and racers that send their moves and undos to different
 * servers in the same instant, round after round, on the same few units. The servers run with
 * SPOOLYARD_TEST_MOVE_STALL_MS, so every move pauses after reading the unit and the requests
 * really are inside a move at once in separate processes. Every outcome is accounted for
 * (tests/helpers/race-rounds.ts) and every unit's row equals the fold of its history at the end.
 *
 * RACE_PROCESS_ROUNDS (default 120) and RACE_SEED replay a run.
 */
import { asc, eq } from 'drizzle-orm';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { coreLot, station, turboModel, user } from '../../src/lib/server/db/schema';
import { receiveUnits, type Actor } from '../../src/lib/server/units';
import { STAGES, type Stage } from '../../src/lib/domain/units/states';
import { FLOOR_ROLES } from '../../src/lib/domain/auth/roles';
import { checkUnits, prepareUnits } from '../helpers/shop-prep';
import { rng } from '../helpers/machine-moves';
import { emptyTally, planRound, roundProblems, tidyPool, type RaceJob, type RaceOutcome, type RacePeople } from '../helpers/race-rounds';
import { Client, DEMO_PEOPLE, cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const PORTS = [4268, 4269, 4270];
const RACERS = 4;
const ROUNDS = Number(process.env.RACE_PROCESS_ROUNDS ?? 120);
const SEED = Number(process.env.RACE_SEED ?? Math.floor(Math.random() * 2 ** 31));
const STALL_MS = 8;
const WHO = ['tech', 'tech2', 'lead', 'owner', 'office'] as const;

let dir: string;
let file: string;
let db: Db;
const servers: RunningServer[] = [];
/** clients[server][actor id] */
const clients: Map<string, Client>[] = [];
let people: RacePeople;
let firstUnits: string[];

beforeAll(async () => {
	await ensureBuilt();
	({ dir, file } = await freshDemoDb());
	firstUnits = prepareUnits(file, 2);
	for (const port of PORTS) {
		// a server left on the port (another run's) would answer for ours and share nothing with our file
		const taken = await fetch(`http://127.0.0.1:${port}/api/health`).then(() => true, () => false);
		if (taken) throw new Error(`Port ${port} is already answering; stop whatever runs there before this test.`);
	}
	// idle keep-alive sockets stay open for the whole run: a post is never retried, so a socket the
	// server closed between two rounds must not be what a racer writes to
	for (const port of PORTS) servers.push(await startServer(file, port, { SPOOLYARD_TEST_MOVE_STALL_MS: String(STALL_MS), KEEP_ALIVE_TIMEOUT: '600', HEADERS_TIMEOUT: '601' }));
	db = openDatabase(file, { migrate: false });
	const actors = new Map<string, Actor>();
	for (const who of WHO) {
		const u = db.select().from(user).where(eq(user.email, DEMO_PEOPLE[who].email)).get()!;
		actors.set(who, { id: u.id, role: u.role });
	}
	people = {
		techs: [actors.get('tech')!, actors.get('tech2')!],
		lead: actors.get('lead')!,
		owner: actors.get('owner')!,
		office: actors.get('office')!,
		names: new Map(WHO.map((w) => [actors.get(w)!.id, w]))
	};
	// one sign-in per person; the session lives in the shared database, so every server knows it
	const first = new Map<string, Client>();
	for (const who of WHO) first.set(actors.get(who)!.id, await signedIn(servers[0].origin, who));
	for (const s of servers) {
		const byActor = new Map<string, Client>();
		for (const [id, c] of first) {
			const mine = s === servers[0] ? c : new Client(s.origin);
			for (const [k, v] of c.cookies) mine.cookies.set(k, v);
			byActor.set(id, mine);
		}
		clients.push(byActor);
	}
}, 600_000);

afterAll(async () => {
	for (const byActor of clients) for (const c of byActor.values()) c.close();
	await Promise.all(servers.map((s) => s.stop()));
	db?.$client.close();
	if (dir) cleanup(dir);
});

async function send(server: number, job: RaceJob): Promise<RaceOutcome> {
	const s = servers[server];
	const client = clients[server].get(job.actor.id)!;
	const started = performance.now();
	const reply =
		job.kind === 'undo'
			? await client.postJson(`/api/units/${job.serial}/undo`, { seq: job.undoSeq, idempotencyKey: job.key }, { origin: s.origin })
			: await client.postJson(
					`/api/units/${job.serial}/events`,
					{ action: job.action, stationCode: job.stationCode, idempotencyKey: job.key, expectedVersion: job.expectedVersion, data: job.data },
					{ origin: s.origin }
				);
	const ms = performance.now() - started;
	let body: { unit?: { version: number; state: string }; error?: { code: string; message: string } };
	try {
		body = reply.json();
	} catch {
		return { key: job.key, threw: `server ${s.port} answered ${reply.status}: ${reply.text.slice(0, 300)}`, ms };
	}
	if (reply.status >= 500) return { key: job.key, threw: `server ${s.port} answered ${reply.status}: ${reply.text.slice(0, 300)}\n${s.log().slice(-600)}`, ms };
	if (reply.status === 201 || reply.status === 200) return { key: job.key, ok: true, status: reply.status, version: body.unit!.version, state: body.unit!.state, ms };
	return { key: job.key, ok: false, status: reply.status, code: body.error?.code ?? `no code (${reply.text.slice(0, 200)})`, message: body.error?.message ?? '', ms };
}

test(`${RACERS} racers on ${PORTS.length} server processes sharing one database file, ${ROUNDS} rounds: every outcome accounted for`, async () => {
	const stationRows = db.select({ code: station.code, stage: station.stage }).from(station).where(eq(station.active, true)).all();
	const stations = Object.fromEntries(STAGES.map((s) => [s, stationRows.filter((r) => r.stage === s).map((r) => r.code)])) as Record<Stage, string[]>;
	const lotId = db.select().from(coreLot).orderBy(asc(coreLot.id)).get()!.id;
	const modelId = db.select().from(turboModel).orderBy(asc(turboModel.id)).get()!.id;
	const random = rng(SEED);
	const pool = [...firstUnits];
	const every = new Set(pool);
	const tally = emptyTally();
	let problems: string[] = [];
	const started = performance.now();
	for (let round = 0; round < ROUNDS && problems.length === 0; round++) {
		const { jobs, snapshots } = planRound(db, round, pool, RACERS, people, stations, random, FLOOR_ROLES);
		// all requests leave in the same tick, each racer to a different server than its neighbour
		const outcomes = await Promise.all(jobs.map((job, i) => send((i + round) % servers.length, job)));
		// (waits for another server's transaction cannot be told apart from HTTP time here: not counted)
		problems = roundProblems(db, snapshots, jobs, outcomes, tally, Number.POSITIVE_INFINITY).map((p) => `round ${round}: ${p}`);
		tidyPool(db, pool, people, tally, () => {
			const [serial] = receiveUnits(db, people.office, lotId, [{ modelId }]);
			every.add(serial);
			return serial;
		});
	}
	const ms = performance.now() - started;
	console.log(`race (server processes, seed ${SEED}): ${tally.rounds} rounds in ${Math.round(ms)} ms; ${JSON.stringify(tally)}`);
	expect(problems, `seed ${SEED}`).toEqual([]);

	const checked = checkUnits(db, [...every]);
	expect(checked).toHaveLength(every.size);
	expect(checked.filter((u) => u.problem !== null).map((u) => `${u.serial}: ${u.problem}`)).toEqual([]);

	// the race was real: racers met on one unit and lost on the version and on the route
	expect(tally.rounds).toBe(ROUNDS);
	expect(tally.contended).toBeGreaterThan(tally.jobs / 2);
	expect(tally.versionConflicts).toBeGreaterThan(ROUNDS / 10);
	expect(tally.refusedAfterAnotherWon).toBeGreaterThan(ROUNDS / 20);
	expect(tally.wins).toBeGreaterThan(ROUNDS);
	// every server process answered some of the moves
	for (const s of servers) expect(s.child.exitCode).toBeNull();
}, 600_000);
