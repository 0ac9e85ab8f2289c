/**
 * A blank reading is not a reading: a balance run, an assembly record or a form number left
 * empty (or sent as null) is refused with a sentence naming the field; "0" typed on purpose is
 * kept as a reading.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { testShop, type TestShop } from '../helpers/db';
import { GOOD_ASSEMBLY, GOOD_RUN } from '../helpers/build-records';
import { applyMove } from '../../src/lib/server/units';
import { recordAssembly } from '../../src/lib/server/balance';
import { balanceRun, unit } from '../../src/lib/server/db/schema';
import type { Role } from '../../src/lib/domain/auth/roles';

const dir = mkdtempSync(join(tmpdir(), 'spoolyard-blank-'));
const dbFile = join(dir, 'api.db');
process.env.DATABASE_URL = dbFile;

let shop: TestShop;
let runs: typeof import('../../src/routes/api/units/[serial=serial]/balance-runs/+server');
let assembly: typeof import('../../src/routes/api/units/[serial=serial]/assembly/+server');
let bench: typeof import('../../src/routes/(app)/units/[serial=serial]/balance/+page.server');

beforeAll(async () => {
	shop = testShop(dbFile);
	runs = await import('../../src/routes/api/units/[serial=serial]/balance-runs/+server');
	assembly = await import('../../src/routes/api/units/[serial=serial]/assembly/+server');
	bench = await import('../../src/routes/(app)/units/[serial=serial]/balance/+page.server');
}, 60_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const locals = (role: Role) => ({ user: { id: shop.actors[role].id, role, name: role, email: '', active: true }, session: null });

const postJson = (handler: (e: never) => Promise<Response> | Response, serial: string, body: unknown) =>
	handler({
		params: { serial },
		locals: locals('tech'),
		request: new Request('http://localhost/x', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) })
	} as never);

/** A unit walked to the balance stage with a good assembly record. */
function assembled(): string {
	const [serial] = shop.receive();
	for (const [action, stationCode] of [['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH'], ['machine', 'LATHE-A'], ['paint', 'PAINT']] as const) {
		expect(applyMove(shop.db, shop.actors.tech, { serial, action, stationCode, idempotencyKey: `${serial}-${action}` }).ok).toBe(true);
	}
	expect(recordAssembly(shop.db, shop.actors.tech, serial, GOOD_ASSEMBLY).ok).toBe(true);
	expect(applyMove(shop.db, shop.actors.tech, { serial, action: 'assemble', stationCode: 'BUILD-1', idempotencyKey: `${serial}-asm` }).ok).toBe(true);
	return serial;
}

function runsOf(serial: string) {
	const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	return shop.db.select().from(balanceRun).where(eq(balanceRun.unitId, u.id)).all();
}

describe('balance runs through the JSON route', () => {
	test.each([
		['an empty string', ''],
		['null', null],
		['spaces', '   ']
	])('a check run whose readings are %s is refused, naming the field, and nothing is stored', async (_, blank) => {
		const serial = assembled();
		const r = await postJson(runs.POST, serial, { ...GOOD_RUN, compAmount: blank, compAngle: blank, turbAmount: blank, turbAngle: blank, stationCode: 'BALANCE' });
		expect(r.status).toBe(400);
		const j = await r.json();
		expect(j.error.message).toMatch(/^Compressor plane amount: /);
		expect(j.error.message).toMatch(/\.$/);
		expect(Object.keys(j.error.fields)).toEqual(expect.arrayContaining(['compAmount', 'compAngle', 'turbAmount', 'turbAngle']));
		expect(runsOf(serial)).toHaveLength(0);
	});

	test('a blank angle beside a real amount is refused too', async () => {
		const serial = assembled();
		const r = await postJson(runs.POST, serial, { ...GOOD_RUN, turbAngle: '' });
		expect(r.status).toBe(400);
		expect((await r.json()).error.message).toMatch(/^Turbine plane angle: /);
	});

	test('"0" typed on purpose is a reading', async () => {
		const serial = assembled();
		const r = await postJson(runs.POST, serial, { ...GOOD_RUN, compAmount: '0', compAngle: '0', turbAmount: 0, turbAngle: '0' });
		expect(r.status).toBe(201);
		const j = await r.json();
		expect(j.run).toMatchObject({ compAmount: 0, compAngle: 0, turbAmount: 0, turbAngle: 0, passed: true });
	});

	test('an unknown key in a run is refused, naming it', async () => {
		const serial = assembled();
		const r = await postJson(runs.POST, serial, { ...GOOD_RUN, passed: true });
		expect(r.status).toBe(400);
		expect((await r.json()).error.message).toContain('"passed"');
		expect(runsOf(serial)).toHaveLength(0);
	});
});

describe('the balance workbench form', () => {
	function form(fields: Record<string, string>) {
		return new Request('http://localhost/units/x/balance?/record', { method: 'POST', body: new URLSearchParams(fields) });
	}

	test('a blank check run is refused with a sentence, and the unit cannot then be balanced', async () => {
		const serial = assembled();
		const fields = { kind: 'check', compAmount: '', compAngle: '', turbAmount: '', turbAngle: '', compWheelSerial: 'CW-400101', shaftWheelSerial: 'SW-400102', speedRpm: '' };
		const out = (await bench.actions.record({ request: form(fields), params: { serial }, locals: locals('tech'), url: new URL('http://localhost/x?station=BALANCE') } as never)) as {
			status: number;
			data: { record: { ok: boolean; message: string } };
		};
		expect(out.status).toBe(400);
		expect(out.data.record.message).toMatch(/^Compressor plane amount: .*\.$/);
		expect(runsOf(serial)).toHaveLength(0);

		const move = (await bench.actions.balanced({
			request: new Request('http://localhost/x', { method: 'POST', body: new URLSearchParams({ idempotencyKey: `${serial}-balanced` }) }),
			params: { serial },
			locals: locals('tech'),
			url: new URL('http://localhost/x?station=BALANCE')
		} as never)) as { status: number };
		expect(move.status).toBe(409);
		expect(shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!.state).toBe('assembled');
	});

	test('zeros typed into the form are kept as readings', async () => {
		const serial = assembled();
		const fields = { kind: 'check', compAmount: '0', compAngle: '0', turbAmount: '0', turbAngle: '0', compWheelSerial: 'CW-400101', shaftWheelSerial: 'SW-400102', speedRpm: '' };
		const out = (await bench.actions.record({ request: form(fields), params: { serial }, locals: locals('tech'), url: new URL('http://localhost/x?station=BALANCE') } as never)) as {
			record: { ok: boolean; passed: boolean };
		};
		expect(out.record).toMatchObject({ ok: true, passed: true });
		expect(runsOf(serial)).toHaveLength(1);
	});
});

describe('assembly readings', () => {
	test('blank plays are refused, naming the field', async () => {
		const [serial] = shop.receive();
		for (const [action, stationCode] of [['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH'], ['machine', 'LATHE-A'], ['paint', 'PAINT']] as const) {
			expect(applyMove(shop.db, shop.actors.tech, { serial, action, stationCode, idempotencyKey: `${serial}-${action}` }).ok).toBe(true);
		}
		const r = await postJson(assembly.POST, serial, { ...GOOD_ASSEMBLY, endPlayMm: '' });
		expect(r.status).toBe(400);
		expect((await r.json()).error.message).toMatch(/^End play: /);
		const n = await postJson(assembly.POST, serial, { ...GOOD_ASSEMBLY, radialPlayMm: null });
		expect(n.status).toBe(400);
		expect((await n.json()).error.message).toMatch(/^Radial play: /);
	});
});
