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

describe('other numbers on writes', () => {
	test('a model spec with a blank bearing position or position count is refused; 0 typed is kept', async () => {
		const { saveSpec } = await import('../../src/lib/server/balance');
		const { specSchema } = await import('../../src/lib/domain/balance/spec');
		const { modelSpec } = await import('../../src/lib/server/db/schema');
		const row = shop.db.select().from(modelSpec).where(eq(modelSpec.modelId, shop.modelId)).get()! as unknown as Record<string, unknown>;
		const spec = Object.fromEntries(Object.keys(specSchema.shape).map((k) => [k, row[k] === null ? '' : String(row[k])]));
		const blankBearing = saveSpec(shop.db, shop.actors.owner, 'CH-F46', { ...spec, centreOfMassMm: ' ' }, {});
		expect(blankBearing).toMatchObject({ ok: false, status: 400, message: 'Centre of mass position: enter a number.' });
		const blankPositions = saveSpec(shop.db, shop.actors.owner, 'CH-F46', { ...spec, positionsComp: '' }, {});
		expect(blankPositions).toMatchObject({ ok: false, status: 400, message: 'Compressor positions: enter a number.' });
		const zero = saveSpec(shop.db, shop.actors.owner, 'CH-F46', { ...spec, positionsComp: '0' }, {});
		expect(zero.ok).toBe(true);
	});

	test('a labour rate of spaces is refused, "0" is a rate', async () => {
		const { labourRateSchema } = await import('../../src/lib/server/reports/settings');
		const blank = labourRateSchema.safeParse({ ratePerHour: '   ' });
		expect(blank.success).toBe(false);
		expect(blank.error?.issues[0]?.message).toBe('Give the labour rate per hour (0 if labour should not be costed).');
		expect(labourRateSchema.parse({ ratePerHour: '0' })).toEqual({ ratePerHour: 0 });
	});

	test('teardown minutes of spaces on the trace-back verdict are no minutes, not 0', async () => {
		const [serial] = shop.receive();
		expect(applyMove(shop.db, shop.actors.tech, { serial, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: `${serial}-inspect` }).ok).toBe(true);
		const page = await import('../../src/routes/(app)/reports/warranty/[serial=serial]/+page.server');
		const fields = { verdict: 'accept', failureMode: 'other', labourMinutes: '  ', idempotencyKey: `${serial}-verdict`, expectedVersion: '2' };
		const out = await page.actions.verdict({
			request: new Request('http://localhost/x', { method: 'POST', body: new URLSearchParams(fields) }),
			params: { serial },
			locals: locals('owner')
		} as never);
		expect(out).toMatchObject({ done: expect.stringContaining(serial) });
		const { unitEvent } = await import('../../src/lib/server/db/schema');
		const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		const last = shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all().at(-1)!;
		expect(last.data).toEqual({ failureMode: 'other' });
	});
});
