import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { testShop, type TestShop } from '../helpers/db';
import { unit, unitEvent } from '../../src/lib/server/db/schema';
import { replay } from '../../src/lib/domain/units/machine';
import type { Role } from '../../src/lib/domain/auth/roles';
import { recordAssembly, recordBalanceRun } from '../../src/lib/server/balance';
import { GOOD_ASSEMBLY, GOOD_RUN } from '../helpers/build-records';

// The route handlers use the application's connection, opened from DATABASE_URL.
const dir = mkdtempSync(join(tmpdir(), 'spoolyard-api-'));
const dbFile = join(dir, 'api.db');
process.env.DATABASE_URL = dbFile;

let shop: TestShop;
let postEvent: (typeof import('../../src/routes/api/units/[serial=serial]/events/+server'))['POST'];
let getUnit: (typeof import('../../src/routes/api/units/[serial=serial]/+server'))['GET'];
let getUnits: (typeof import('../../src/routes/api/units/+server'))['GET'];
let getStations: (typeof import('../../src/routes/api/stations/+server'))['GET'];

beforeAll(async () => {
	shop = testShop(dbFile);
	postEvent = (await import('../../src/routes/api/units/[serial=serial]/events/+server')).POST;
	getUnit = (await import('../../src/routes/api/units/[serial=serial]/+server')).GET;
	getUnits = (await import('../../src/routes/api/units/+server')).GET;
	getStations = (await import('../../src/routes/api/stations/+server')).GET;
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

let keyN = 0;
const key = () => `test-key-${++keyN}-${Date.now()}`;

function post(serial: string, role: Role, body: unknown, raw = false) {
	const request = new Request(`http://localhost/api/units/${serial}/events`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: raw ? (body as string) : JSON.stringify(body)
	});
	const actor = shop.actors[role];
	// eslint-disable-next-line @typescript-eslint/no-explicit-any
	return postEvent({ params: { serial }, request, locals: { user: { ...actor, name: role, email: '', active: true }, session: null } } as any);
}

async function body(res: Response) {
	return { status: res.status, json: await res.json() };
}

describe('POST /api/units/{serial}/events', () => {
	test('a move at the right station appends one event and bumps the version', async () => {
		const [serial] = shop.receive();
		const r = await body(await post(serial, 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key() }));
		expect(r.status).toBe(201);
		expect(r.json.unit).toMatchObject({ serial, state: 'inspected', version: 2 });
		expect(r.json.event).toMatchObject({ seq: 2, action: 'inspect', fromState: 'received', toState: 'inspected', station: { code: 'TEARDOWN-1' } });
	});

	test('the same idempotency key twice gives the first result and no second event', async () => {
		const [serial] = shop.receive();
		const k = key();
		const first = await body(await post(serial, 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: k }));
		const second = await body(await post(serial, 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: k }));
		expect(first.status).toBe(201);
		expect(second.status).toBe(200);
		expect(second.json.replayed).toBe(true);
		expect(second.json.event).toEqual(first.json.event);
		const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		expect(shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all()).toHaveLength(2);
	});

	test('a key reused for a different move is refused', async () => {
		const [a, b] = shop.receive(2);
		const k = key();
		await post(a, 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: k });
		const r = await body(await post(b, 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: k }));
		expect(r.status).toBe(422);
		expect(r.json.error.code).toBe('key_reused');
	});

	test('a wrong expected version is a 409 with the unit’s current state', async () => {
		const [serial] = shop.receive();
		const r = await body(await post(serial, 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key(), expectedVersion: 7 }));
		expect(r.status).toBe(409);
		expect(r.json.error.code).toBe('version_conflict');
		expect(r.json.unit).toMatchObject({ serial, state: 'received', version: 1 });
	});

	test('a move out of order is a 409 with a sentence a tech understands', async () => {
		const [serial] = shop.receive();
		const r = await body(await post(serial, 'tech', { action: 'paint', stationCode: 'PAINT', idempotencyKey: key() }));
		expect(r.status).toBe(409);
		expect(r.json.error.message).toBe(`${serial} is received; paint needs it inspected, accepted, cleaned and machined first.`);
		expect(r.json.unit.state).toBe('received');
	});

	test('a bad body is a 400 with field errors', async () => {
		const [serial] = shop.receive();
		const r = await body(await post(serial, 'tech', { action: 'fly', idempotencyKey: 'x' }));
		expect(r.status).toBe(400);
		expect(Object.keys(r.json.error.fields)).toEqual(expect.arrayContaining(['action', 'idempotencyKey']));
		const notJson = await body(await post(serial, 'tech', '{not json', true));
		expect(notJson.status).toBe(400);
		const scrapNoReason = await body(await post(serial, 'lead', { action: 'scrap', idempotencyKey: key() }));
		expect(scrapNoReason.status).toBe(400);
		expect(scrapNoReason.json.error.fields.reasonCode).toEqual(['Choose a scrap reason.']);
	});

	test('an unknown serial is a 404; an unknown station a 400', async () => {
		const r = await body(await post('SY-99999', 'tech', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key() }));
		expect(r.status).toBe(404);
		const [serial] = shop.receive();
		const s = await body(await post(serial, 'tech', { action: 'inspect', stationCode: 'NO-SUCH', idempotencyKey: key() }));
		expect(s.status).toBe(400);
	});

	test('a role that may not make the move gets 403', async () => {
		const [serial] = shop.receive();
		const r = await body(await post(serial, 'office', { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key() }));
		expect(r.status).toBe(403);
		const rework = await body(await post(serial, 'tech', { action: 'rework', idempotencyKey: key(), data: { toStage: 'paint', reason: 'runs' } }));
		expect(rework.status).toBe(403);
	});

	test('a unit walked to shipped: the stored state is the fold of its events', async () => {
		const [serial] = shop.receive();
		const steps: [string, string][] = [
			['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH'], ['machine', 'LATHE-B'], ['paint', 'PAINT'],
			['assemble', 'BUILD-1'], ['balance', 'BALANCE'], ['pack', 'PACK'], ['ship', 'SHIP']
		];
		const make = async (part: [string, string][]) => {
			for (const [action, stationCode] of part) {
				const r = await post(serial, 'tech', { action, stationCode, idempotencyKey: key() });
				expect(r.status, action).toBe(201);
			}
		};
		// The build records the assemble and balance moves need (their guards are tested in balance.test.ts).
		await make(steps.slice(0, 5));
		expect(recordAssembly(shop.db, shop.actors.tech, serial, GOOD_ASSEMBLY).ok).toBe(true);
		await make(steps.slice(5, 6));
		expect(recordBalanceRun(shop.db, shop.actors.tech, serial, GOOD_RUN).ok).toBe(true);
		await make(steps.slice(6));
		const got = await body(await getUnit({ params: { serial } } as never));
		expect(got.json.unit.state).toBe('shipped');
		expect(got.json.history.map((e: { action: string }) => e.action)).toEqual(['receive', ...steps.map((s) => s[0])]);
		expect(replay(serial, got.json.history)).toMatchObject({ state: 'shipped', held: false });
	});
});

describe('GET routes', () => {
	test('units list filters and pages; stations list', async () => {
		shop.receive(3);
		const all = await body(await getUnits({ url: new URL('http://localhost/api/units?state=received&pageSize=2') } as never));
		expect(all.status).toBe(200);
		expect(all.json.items).toHaveLength(2);
		expect(all.json.total).toBeGreaterThanOrEqual(3);
		for (const u of all.json.items) expect(u.state).toBe('received');
		const bad = await body(await getUnits({ url: new URL('http://localhost/api/units?state=melted') } as never));
		expect(bad.status).toBe(400);
		const st = await body(await getStations({} as never));
		expect(st.json.stations.map((s: { code: string }) => s.code)).toContain('BALANCE');
		const missing = await body(await getUnit({ params: { serial: 'SY-99998' } } as never));
		expect(missing.status).toBe(404);
	});
});

describe('two concurrent moves of one unit', () => {
	function moveFromAnotherProcess(serial: string, station: string, role: Role, k: string, startAt: number): Promise<{ ok: boolean; status: number }> {
		return new Promise((resolve, reject) => {
			const child = spawn('npx', ['tsx', 'tests/helpers/move-once.ts', dbFile, serial, station, shop.actors[role].id, role, 'clean', k, String(startAt)], {
				stdio: ['ignore', 'pipe', 'inherit']
			});
			let out = '';
			child.stdout.on('data', (d) => (out += d));
			child.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out)) : reject(new Error(`exit ${code}`))));
		});
	}

	test('two stations, two processes, one unit: exactly one wins', async () => {
		const [serial] = shop.receive();
		for (const action of ['inspect', 'accept']) {
			await post(serial, 'tech', { action, stationCode: 'TEARDOWN-1', idempotencyKey: key() });
		}
		const startAt = Date.now() + 2500;
		const [a, b] = await Promise.all([
			moveFromAnotherProcess(serial, 'WASH', 'tech', key(), startAt),
			moveFromAnotherProcess(serial, 'BLAST', 'lead', key(), startAt)
		]);
		expect([a.status, b.status].sort()).toEqual([201, 409]);
		const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		const events = shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all();
		expect(events.filter((e) => e.action === 'clean')).toHaveLength(1);
		expect(u.state).toBe('cleaned');
		expect(replay(serial, events).state).toBe(u.state);
	}, 30_000);
});

describe('the history is append-only in the database', () => {
	test('UPDATE and DELETE on unit_event are refused by triggers', () => {
		const [serial] = shop.receive();
		const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		expect(() => shop.db.update(unitEvent).set({ note: 'edited' }).where(eq(unitEvent.unitId, u.id)).run()).toThrow(/append-only/);
		expect(() => shop.db.delete(unitEvent).where(eq(unitEvent.unitId, u.id)).run()).toThrow(/append-only/);
	});
});
