import { beforeEach, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { testShop, type TestShop } from '../helpers/db';
import { FAILING_RUN, GOOD_ASSEMBLY, GOOD_RUN } from '../helpers/build-records';
import { applyMove } from '../../src/lib/server/units';
import { buildRecord, hasPassingBalance, lastSeqInto, recordAssembly, recordBalanceRun, saveSpec } from '../../src/lib/server/balance';
import { assemblyRecord, balanceRun, modelSpec, unit, unitEvent } from '../../src/lib/server/db/schema';
import { openDatabase } from '../../src/lib/server/db/index';
import { seedDemo } from '../../src/lib/server/seed';
import { demoSpecNumbers } from '../../src/lib/server/seed-balance';

let shop: TestShop;
let n = 0;
const key = () => `bal-${++n}-${Math.random()}`;

function walkToPainted(serial: string) {
	const steps: [string, string][] = [['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH'], ['machine', 'LATHE-A'], ['paint', 'PAINT']];
	for (const [action, stationCode] of steps) {
		const r = applyMove(shop.db, shop.actors.tech, { serial, action: action as never, stationCode, idempotencyKey: key() });
		expect(r.ok, `${action}: ${r.ok ? '' : r.message}`).toBe(true);
	}
}
function walkToAssembled(serial: string) {
	walkToPainted(serial);
	expect(recordAssembly(shop.db, shop.actors.tech, serial, GOOD_ASSEMBLY).ok).toBe(true);
	expect(move(serial, 'assemble', 'BUILD-1').ok).toBe(true);
}
/** Assert a service answer is a success and give it back narrowed to the success shape. */
function succeeded<T extends { ok: boolean }>(r: T): Extract<T, { ok: true }> {
	expect(r, 'the service answered with a refusal').toMatchObject({ ok: true });
	return r as Extract<T, { ok: true }>;
}
const move = (serial: string, action: string, stationCode: string | null, role: 'tech' | 'lead' = 'tech', data?: Record<string, unknown>) =>
	applyMove(shop.db, shop.actors[role], { serial, action: action as never, stationCode, idempotencyKey: key(), data });
const count = (table: typeof assemblyRecord | typeof balanceRun) => shop.db.select().from(table).all().length;

beforeEach(() => {
	shop = testShop();
});

describe('assembly record', () => {
	test('out-of-limit end play is refused with the reason, and nothing is saved', () => {
		const [serial] = shop.receive();
		walkToPainted(serial);
		const r = recordAssembly(shop.db, shop.actors.tech, serial, { ...GOOD_ASSEMBLY, endPlayMm: 0.12 });
		expect(r).toMatchObject({ ok: false, status: 409 });
		expect(!r.ok && r.message).toBe('Refused: End play 0.120 mm is above the maximum 0.090 mm.');
		expect(count(assemblyRecord)).toBe(0);
		const refused = move(serial, 'assemble', 'BUILD-1');
		expect(refused).toMatchObject({ ok: false, status: 409 });
		expect(!refused.ok && refused.message).toContain('has no assembly record within limits');
	});

	test('a wastegate preset above the window says it can overspeed the wheel', () => {
		const [serial] = shop.receive();
		walkToPainted(serial);
		const r = recordAssembly(shop.db, shop.actors.tech, serial, { ...GOOD_ASSEMBLY, wastegatePresetKpa: 130 });
		expect(!r.ok && r.message).toContain('Wastegate preset 130.0 kPa (18.9 psi) is above the maximum 110.0 kPa (16.0 psi). Boost above the window can overspeed the wheel.');
	});

	test('only a lead or the owner records a deviation, with a reason; then assembly may proceed', () => {
		const [serial] = shop.receive();
		walkToPainted(serial);
		const out = { ...GOOD_ASSEMBLY, radialPlayMm: 0.65, deviationReason: 'Customer accepts, new bearing ordered' };
		const byTech = recordAssembly(shop.db, shop.actors.tech, serial, out);
		expect(byTech).toMatchObject({ ok: false, status: 403 });
		expect(count(assemblyRecord)).toBe(0);
		const tooShort = recordAssembly(shop.db, shop.actors.lead, serial, { ...out, deviationReason: 'ok' });
		expect(tooShort).toMatchObject({ ok: false, status: 400 });
		const byLead = succeeded(recordAssembly(shop.db, shop.actors.lead, serial, out));
		expect(byLead.record.withinLimits).toBe(false);
		expect(byLead.record.approvedBy).toBe(shop.actors.lead.id);
		expect(byLead.record.findings).toEqual(['Radial play 0.650 mm is above the maximum 0.600 mm.']);
		expect(move(serial, 'assemble', 'BUILD-1').ok).toBe(true);
	});

	test('bad input loses nothing and says what is wrong; a unit not painted is refused', () => {
		const [serial] = shop.receive();
		const early = recordAssembly(shop.db, shop.actors.tech, serial, GOOD_ASSEMBLY);
		expect(!early.ok && early.message).toBe(`${serial} is received; the assembly record is recorded while it is painted.`);
		walkToPainted(serial);
		const bad = recordAssembly(shop.db, shop.actors.tech, serial, { ...GOOD_ASSEMBLY, bearingKitLot: '  ', endPlayMm: 'abc' });
		expect(bad).toMatchObject({ ok: false, status: 400 });
		expect(!bad.ok && Object.keys(bad.fields ?? {})).toEqual(expect.arrayContaining(['endPlayMm', 'bearingKitLot']));
		expect(count(assemblyRecord)).toBe(0);
	});
});

describe('balance runs and the balance guard', () => {
	test('a failing run shows the correction and does not let the unit be balanced; a passing run does', () => {
		const [serial] = shop.receive();
		walkToAssembled(serial);
		expect(move(serial, 'balance', 'BALANCE')).toMatchObject({ ok: false, status: 409 });
		const fail = succeeded(recordBalanceRun(shop.db, shop.actors.tech, serial, FAILING_RUN, { stationCode: 'BALANCE' }));
		expect(fail.record.run.passed).toBe(false);
		expect(fail.record.evaluation?.corrections).toHaveLength(2);
		// Remove mode (the demo spec): the correction is the reading itself, at the heavy spot.
		expect(fail.record.evaluation?.corrections[0]).toMatchObject({ key: 'comp', mode: 'remove' });
		expect(fail.record.evaluation?.corrections[0].amount).toBeCloseTo(20, 9);
		expect(fail.record.evaluation?.corrections[0].angle).toBeCloseTo(40, 9);
		expect(fail.record.evaluation?.corrections[0].split?.map((p) => p.angle)).toEqual([30, 60]);
		const refused = move(serial, 'balance', 'BALANCE');
		expect(!refused.ok && refused.message).toBe(`${serial} has no passing balance run since it was assembled; record the runs on its balance page first.`);
		const pass = recordBalanceRun(shop.db, shop.actors.tech, serial, GOOD_RUN, { stationCode: 'BALANCE' });
		expect(pass.ok && pass.record.run.passed).toBe(true);
		expect(move(serial, 'balance', 'BALANCE').ok).toBe(true);
		const rec = buildRecord(shop.db, shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!.id);
		expect(rec.runs.map((r) => [r.runNo, r.kind, r.passed, r.userName])).toEqual([
			[1, 'initial', false, 'Test tech'],
			[2, 'check', true, 'Test tech']
		]);
		expect(rec.assemblies).toHaveLength(1);
	});

	test('after a send-back to assembly the unit needs a new assembly record and a new passing run', () => {
		const [serial] = shop.receive();
		walkToAssembled(serial);
		recordBalanceRun(shop.db, shop.actors.tech, serial, GOOD_RUN);
		expect(move(serial, 'balance', 'BALANCE').ok).toBe(true);
		expect(move(serial, 'rework', null, 'lead', { toStage: 'assemble', reason: 'Noise on the check spin' }).ok).toBe(true);
		expect(move(serial, 'assemble', 'BUILD-1')).toMatchObject({ ok: false, status: 409 });
		expect(recordAssembly(shop.db, shop.actors.tech, serial, GOOD_ASSEMBLY).ok).toBe(true);
		expect(move(serial, 'assemble', 'BUILD-1').ok).toBe(true);
		expect(move(serial, 'balance', 'BALANCE')).toMatchObject({ ok: false, status: 409 });
		recordBalanceRun(shop.db, shop.actors.tech, serial, GOOD_RUN);
		expect(move(serial, 'balance', 'BALANCE').ok).toBe(true);
	});

	test('trial runs give two-plane influence coefficients; a trial run alone does not pass', () => {
		const [serial] = shop.receive();
		walkToAssembled(serial);
		const base = { compWheelSerial: 'CW-1', shaftWheelSerial: 'SW-1' };
		recordBalanceRun(shop.db, shop.actors.tech, serial, { ...base, kind: 'initial', compAmount: 170, compAngle: 112, turbAmount: 53, turbAngle: 78 });
		const t1 = recordBalanceRun(shop.db, shop.actors.tech, serial, { ...base, kind: 'trial', trialPlane: 'comp', trialAmount: 1.15, trialAngle: 0, compAmount: 235, compAngle: 94, turbAmount: 58, turbAngle: 68 });
		expect(t1.ok && t1.record.run.passed).toBe(false);
		recordBalanceRun(shop.db, shop.actors.tech, serial, { ...base, kind: 'trial', trialPlane: 'turb', trialAmount: 1.15, trialAngle: 0, compAmount: 185, compAngle: 115, turbAmount: 77, turbAngle: 104 });
		// The check run repeats the initial reading: the calculator gives the worked two-plane answer
		// (Vaughan, B&K 17-227, table 2, example 6: 1.979 g @ 236.2° and 1.071 g @ 121.8° to add; remove is 180° away).
		const check = succeeded(recordBalanceRun(shop.db, shop.actors.tech, serial, { ...base, kind: 'check', compAmount: 170, compAngle: 112, turbAmount: 53, turbAngle: 78 }));
		expect(check.record.run.method).toBe('two-plane');
		const [c1, c2] = check.record.evaluation!.corrections;
		expect(c1.amount).toBeCloseTo(1.979, 3);
		expect(c1.angle).toBeCloseTo(56.2, 1);
		expect(c2.amount).toBeCloseTo(1.071, 3);
		expect(c2.angle).toBeCloseTo(301.8, 1);
		const missing = recordBalanceRun(shop.db, shop.actors.tech, serial, { ...base, kind: 'trial', compAmount: 1, compAngle: 0, turbAmount: 1, turbAngle: 0 });
		expect(missing).toMatchObject({ ok: false, status: 400 });
		const angle = recordBalanceRun(shop.db, shop.actors.tech, serial, { ...GOOD_RUN, compAngle: 360 });
		expect(!angle.ok && angle.message).toBe('Compressor plane angle: an angle from 0 to 359.9°.');
	});

	test('a run on a unit that is not assembled is refused', () => {
		const [serial] = shop.receive();
		const r = recordBalanceRun(shop.db, shop.actors.tech, serial, GOOD_RUN);
		expect(!r.ok && r.message).toBe(`${serial} is received; a balance run is recorded while it is assembled.`);
		expect(count(balanceRun)).toBe(0);
	});
});

describe('model specs', () => {
	test('only the owner saves a spec; cross-field mistakes name the field', () => {
		const good = { ...demoSpecNumbers('CH-F46'), gradeG: 2.5 };
		expect(saveSpec(shop.db, shop.actors.lead, 'CH-F46', good, {})).toMatchObject({ ok: false, status: 403 });
		const bad = saveSpec(shop.db, shop.actors.owner, 'CH-F46', { ...good, endPlayMinMm: 0.1, endPlayMaxMm: 0.05 }, {});
		expect(bad).toMatchObject({ ok: false, status: 400 });
		expect(!bad.ok && bad.fields?.endPlayMaxMm).toEqual(['End play: the maximum is below the minimum.']);
		const ok = saveSpec(shop.db, shop.actors.owner, 'CH-F46', good, { gradeG: 'shop' });
		expect(ok.ok).toBe(true);
		const row = shop.db.select().from(modelSpec).get()!;
		expect(row.gradeG).toBe(2.5);
		expect(row.sources.gradeG).toBe('shop');
		expect(row.sources.rotorMassKg).toBe('maker');
		expect(row.demo).toBe(false);
	});
});

test('the demo seed gives every seeded assemble and balance move its record', async () => {
	const db = openDatabase(':memory:');
	await seedDemo(db, { lots: 8, now: new Date('2026-12-01T12:00:00Z') });
	const events = db.select().from(unitEvent).all();
	const runs = db.select().from(balanceRun).all();
	const assemblies = db.select().from(assemblyRecord).all();
	const lastInto = (e: (typeof events)[number], state: string) =>
		Math.max(...events.filter((x) => x.unitId === e.unitId && x.toState === state && x.seq < e.seq).map((x) => x.seq));
	const balances = events.filter((e) => e.action === 'balance');
	const assembles = events.filter((e) => e.action === 'assemble');
	const balancedWithoutRun = balances.filter(
		(e) => !runs.some((r) => r.unitId === e.unitId && r.passed && r.afterSeq >= lastInto(e, 'assembled') && r.afterSeq <= e.seq - 1)
	);
	const assembledWithoutRecord = assembles.filter(
		(e) => !assemblies.some((r) => r.unitId === e.unitId && r.withinLimits && r.afterSeq >= lastInto(e, 'painted') && r.afterSeq <= e.seq - 1)
	);
	expect(balancedWithoutRun.map((e) => e.id)).toEqual([]);
	expect(assembledWithoutRecord.map((e) => e.id)).toEqual([]);
	expect(balances.length + assembles.length).toBeGreaterThan(50);
	const balancedUnit = db.select().from(unit).where(eq(unit.state, 'balanced')).get();
	expect(balancedUnit?.state, 'the demo seed leaves a unit balanced').toBe('balanced');
	expect(hasPassingBalance(db, balancedUnit!.id)).toBe(true);
	expect(lastSeqInto(db, -1, 'assembled')).toBe(0);
});
