/**
 * The JSON writes take only what they declare: unknown keys, deep nesting and oversized bodies are
 * refused with a sentence before anything reaches the append-only history, and the keys the shop's
 * own screens send keep working.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { testShop, type TestShop } from '../helpers/db';
import { unit, unitEvent } from '../../src/lib/server/db/schema';
import { applyMove } from '../../src/lib/server/units';
import type { Role } from '../../src/lib/domain/auth/roles';

const dir = mkdtempSync(join(tmpdir(), 'spoolyard-strict-'));
const dbFile = join(dir, 'api.db');
process.env.DATABASE_URL = dbFile;

let shop: TestShop;
let postEvent: (typeof import('../../src/routes/api/units/[serial=serial]/events/+server'))['POST'];
let postUndo: (typeof import('../../src/routes/api/units/[serial=serial]/undo/+server'))['POST'];
let putOrder: (typeof import('../../src/routes/api/cards/order/+server'))['PUT'];
let getUnit: (typeof import('../../src/routes/api/units/[serial=serial]/+server'))['GET'];

beforeAll(async () => {
	shop = testShop(dbFile);
	postEvent = (await import('../../src/routes/api/units/[serial=serial]/events/+server')).POST;
	postUndo = (await import('../../src/routes/api/units/[serial=serial]/undo/+server')).POST;
	putOrder = (await import('../../src/routes/api/cards/order/+server')).PUT;
	getUnit = (await import('../../src/routes/api/units/[serial=serial]/+server')).GET;
}, 60_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

let keyN = 0;
const key = () => `strict-key-${++keyN}-${Date.now()}`;

function event(role: Role, serial: string, body: unknown, headers: Record<string, string> = {}) {
	const actor = shop.actors[role];
	const request = new Request(`http://localhost/api/units/${serial}/events`, {
		method: 'POST',
		headers: { 'content-type': 'application/json', ...headers },
		body: typeof body === 'string' ? body : JSON.stringify(body)
	});
	return postEvent({ params: { serial }, request, locals: { user: { ...actor, name: role, email: '', active: true }, session: null } } as never);
}

async function answer(res: Response | Promise<Response>) {
	const r = await res;
	return { status: r.status, json: await r.json() };
}

/** `[[[ … ]]]` nested `levels` deep, as raw JSON text (JSON.stringify itself overflows on deep values). */
const nested = (levels: number) => '['.repeat(levels) + ']'.repeat(levels);

function eventsOf(serial: string) {
	const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	return shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all();
}

describe('deep nesting never reaches the history', () => {
	test.each([40, 4000, 5000])('a hold whose data nests %i levels deep is a 400 with a sentence, and nothing is stored', async (levels) => {
		const [serial] = shop.receive();
		const body = `{"action":"hold","stationCode":"TEARDOWN-1","idempotencyKey":"${key()}","data":{"reason":"x y z","x":${nested(levels)}}}`;
		const r = await answer(event('tech', serial, body));
		expect(r.status).toBe(400);
		expect(r.json.error.message).toMatch(/nest/i);
		expect(eventsOf(serial)).toHaveLength(1);
		expect((await getUnit({ params: { serial } } as never)).status).toBe(200);
	});

	test.each([1500, 2500, 3500])('an inspect whose data nests %i levels deep is refused, not a server error', async (levels) => {
		const [serial] = shop.receive();
		const body = `{"action":"inspect","stationCode":"TEARDOWN-1","idempotencyKey":"${key()}","data":{"x":${nested(levels)}}}`;
		const r = await answer(event('tech', serial, body));
		expect(r.status).toBe(400);
		expect(r.json.error.message).toMatch(/nest/i);
		expect(eventsOf(serial)).toHaveLength(1);
	});

	test('nesting inside strings does not count, and a body under the depth limit still parses', async () => {
		const [serial] = shop.receive();
		const r = await answer(event('tech', serial, { action: 'hold', stationCode: 'TEARDOWN-1', idempotencyKey: key(), data: { reason: '[[[[[{{{{ brackets in words ]]]' } }));
		expect(r.status).toBe(201);
		expect(r.json.unit.holdReason).toBe('[[[[[{{{{ brackets in words ]]]');
	});
});

describe('unknown keys are refused, naming the key', () => {
	test('an extra key in the data of a hold', async () => {
		const [serial] = shop.receive();
		const r = await answer(event('tech', serial, { action: 'hold', stationCode: 'TEARDOWN-1', idempotencyKey: key(), data: { reason: 'waiting for a wheel', x: 1 } }));
		expect(r.status).toBe(400);
		expect(r.json.error.message).toContain('"x"');
		expect(r.json.error.fields.x).toEqual(['A hold does not take the field "x"; remove it.']);
		expect(eventsOf(serial)).toHaveLength(1);
	});

	test.each(['inspect', 'clean', 'release', 'return', 'ship'])('a %s with a key it does not declare', async (action) => {
		const [serial] = shop.receive();
		const r = await answer(event('lead', serial, { action, idempotencyKey: key(), data: { colour: 'red' } }));
		expect(r.status).toBe(400);
		expect(r.json.error.message).toContain('"colour"');
		expect(eventsOf(serial)).toHaveLength(1);
	});

	test('an extra key at the top of the body', async () => {
		const [serial] = shop.receive();
		const r = await answer(event('tech', serial, { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key(), sneaky: true }));
		expect(r.status).toBe(400);
		expect(r.json.error.message).toContain('"sneaky"');
	});

	test('the undo and the card order bodies are strict too', async () => {
		const [serial] = shop.receive();
		const actor = shop.actors.tech;
		const locals = { user: { ...actor, name: 'tech', email: '', active: true }, session: null };
		const undo = await answer(
			postUndo({
				params: { serial },
				request: new Request('http://localhost/x', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ idempotencyKey: key(), extra: 1 }) }),
				locals
			} as never)
		);
		expect(undo.status).toBe(400);
		expect(undo.json.error.message).toContain('"extra"');
		const lead = shop.actors.lead;
		const order = await answer(
			putOrder({
				request: new Request('http://localhost/x', { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ order: [{ id: 1, version: 1, rank: 2 }] }) }),
				locals: { user: { ...lead, name: 'lead', email: '', active: true }, session: null }
			} as never)
		);
		expect(order.status).toBe(400);
		expect(order.json.error.message).toContain('"rank"');
	});
});

describe('bounded strings and bodies', () => {
	test('a body over the route limit is a 413 with a sentence', async () => {
		const [serial] = shop.receive();
		const r = await answer(event('tech', serial, { action: 'hold', stationCode: 'TEARDOWN-1', idempotencyKey: key(), note: 'n'.repeat(200_000), data: { reason: 'waiting' } }));
		expect(r.status).toBe(413);
		expect(r.json.error.message).toMatch(/too large/i);
		expect(eventsOf(serial)).toHaveLength(1);
	});

	test('multi-byte text is measured in bytes, not characters', async () => {
		const [serial] = shop.receive();
		// 20,000 four-byte characters: 80 kB on the wire, 40,000 UTF-16 units
		const r = await answer(event('tech', serial, { action: 'hold', stationCode: 'TEARDOWN-1', idempotencyKey: key(), note: '𝄞'.repeat(20_000), data: { reason: 'waiting' } }));
		expect(r.status).toBe(413);
	});

	test('a reason over its limit is refused with a sentence', async () => {
		const [serial] = shop.receive();
		const r = await answer(event('tech', serial, { action: 'hold', stationCode: 'TEARDOWN-1', idempotencyKey: key(), data: { reason: 'r'.repeat(501) } }));
		expect(r.status).toBe(400);
		expect(r.json.error.message).toBe('Keep the reason under 500 characters.');
		expect(r.json.error.fields.reason).toBeDefined();
	});
});

describe('what the shop sends today still works', () => {
	test('teardown minutes, failure mode, scrap reason and the qualification flag are declared', () => {
		const [a, b] = shop.receive(2);
		const at = { stationCode: 'TEARDOWN-1' };
		const ok = (r: ReturnType<typeof applyMove>) => expect(r.ok, r.ok ? '' : r.message).toBe(true);
		ok(applyMove(shop.db, shop.actors.tech, { serial: a, ...at, action: 'inspect', idempotencyKey: key(), data: { labourMinutes: 25 } }));
		ok(applyMove(shop.db, shop.actors.tech, { serial: a, ...at, action: 'accept', idempotencyKey: key(), data: { labourMinutes: 5, inspected: true, failureMode: 'oil_starvation' } }));
		ok(applyMove(shop.db, shop.actors.tech, { serial: b, ...at, action: 'inspect', idempotencyKey: key() }));
		ok(applyMove(shop.db, shop.actors.tech, { serial: b, ...at, action: 'scrap', idempotencyKey: key(), data: { reasonCode: 'TH-CRACK', labourMinutes: 10, inspected: true } }));
		ok(applyMove(shop.db, shop.actors.lead, { serial: a, action: 'hold', idempotencyKey: key(), data: { reason: 'Customer asked to pause' } }));
		ok(applyMove(shop.db, shop.actors.lead, { serial: a, action: 'release', idempotencyKey: key(), data: {} }));
	});

	test('a rework names its stage and reason', async () => {
		const [serial] = shop.receive();
		for (const [action, stationCode] of [['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH'], ['machine', 'LATHE-A']] as const) {
			expect(applyMove(shop.db, shop.actors.tech, { serial, action, stationCode, idempotencyKey: key() }).ok).toBe(true);
		}
		const r = await answer(event('lead', serial, { action: 'rework', idempotencyKey: key(), data: { toStage: 'clean', reason: 'oil in the bore' } }));
		expect(r.status).toBe(201);
		expect(r.json.unit.state).toBe('accepted');
	});
});
