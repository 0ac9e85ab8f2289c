/**
 * Two techs at two stations scan the same unit at the same moment, over HTTP against the built
 * server, RACE_ROUNDS times (default 1000): exactly one move is accepted and recorded, the other
 * gets 409, and every unit's row equals the fold of its history.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openDatabase } from '../../src/lib/server/db/index';
import { checkUnits, prepareUnits } from '../helpers/shop-prep';
import { Client, cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const PORT = 4264;
const ROUNDS = Number(process.env.RACE_ROUNDS ?? 1000);
let server: RunningServer;
let dir: string;
let serials: string[];
let rui: Client;
let dana: Client;

beforeAll(async () => {
	await ensureBuilt();
	const db = await freshDemoDb();
	dir = db.dir;
	serials = prepareUnits(db.file, ROUNDS, [
		['inspect', 'TEARDOWN-1'],
		['accept', 'TEARDOWN-1']
	]);
	server = await startServer(db.file, PORT);
	rui = await signedIn(server.origin, 'tech');
	dana = await signedIn(server.origin, 'tech2');
}, 300_000);

afterAll(async () => {
	rui?.close();
	dana?.close();
	await server?.stop();
	if (dir) cleanup(dir);
});

test(`${ROUNDS} rounds of two concurrent moves of one unit: one wins, the other gets 409`, async () => {
	const winners = new Map<string, string>();
	const loserCodes = new Map<string, number>();
	const started = performance.now();
	for (let i = 0; i < ROUNDS; i++) {
		const serial = serials[i];
		// half the rounds also send the version the tech saw (both saw 3)
		const expectedVersion = i % 2 === 0 ? { expectedVersion: 3 } : {};
		const [a, b] = await Promise.all([
			rui.postJson(`/api/units/${serial}/events`, { action: 'clean', stationCode: 'WASH', idempotencyKey: `race-${serial}-wash`, ...expectedVersion }, { origin: server.origin }),
			dana.postJson(`/api/units/${serial}/events`, { action: 'clean', stationCode: 'BLAST', idempotencyKey: `race-${serial}-blast`, ...expectedVersion }, { origin: server.origin })
		]);
		expect([a.status, b.status].sort(), `${serial}: ${a.text} | ${b.text}`).toEqual([201, 409]);
		const [win, lose] = a.status === 201 ? [a, b] : [b, a];
		winners.set(serial, win.json().event.station.code);
		const code = lose.json().error.code as string;
		loserCodes.set(code, (loserCodes.get(code) ?? 0) + 1);
		expect(lose.json().unit).toMatchObject({ serial, state: 'cleaned', version: 4 });
	}
	const ms = performance.now() - started;

	const db = openDatabase(server.dbFile, { migrate: false });
	try {
		const checked = checkUnits(db, serials);
		expect(checked).toHaveLength(ROUNDS);
		for (const u of checked) {
			expect(u.problem, u.serial).toBeNull();
			const cleans = u.events.filter((e) => e.action === 'clean');
			expect(cleans, u.serial).toHaveLength(1);
			expect(u.state).toBe('cleaned');
			expect(u.version).toBe(4);
			const station = db.$client.prepare('select code from station where id = ?').pluck().get(cleans[0].stationId);
			expect(station).toBe(winners.get(u.serial));
		}
	} finally {
		db.$client.close();
	}
	const wash = [...winners.values()].filter((c) => c === 'WASH').length;
	console.log(
		`race: ${ROUNDS} rounds in ${Math.round(ms)} ms; WASH won ${wash}, BLAST ${ROUNDS - wash}; losers: ${JSON.stringify(Object.fromEntries(loserCodes))}`
	);
}, 600_000);
