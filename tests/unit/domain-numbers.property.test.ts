/**
 * Every exported numeric function of src/lib/domain, called with arbitrary doubles (NaN, ±Infinity,
 * −0, the largest and smallest doubles included) and integers, either returns finite numbers (or a
 * structure whose numbers are all finite, and text with no "NaN" or "Infinity" in it) or throws a
 * RangeError. Nothing else: no TypeError, no NaN, no Infinity out.
 *
 * The table below names each function explicitly; a second test lists every function the domain
 * modules export and fails when one is neither in the table nor set aside with a reason, so a
 * new export is noticed.
 */
import fc from 'fast-check';
import { readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { FLOW, UNIT_STATES } from '../../src/lib/domain/units/states';

const DOMAIN = join(__dirname, '../../src/lib/domain');
const RUNS = 200;

// ---- arbitraries ---------------------------------------------------------------------------

/** Any double, NaN and the infinities included, plus the edges that break naive arithmetic. */
const wild = fc.oneof(
	{ weight: 4, arbitrary: fc.double() },
	{ weight: 2, arbitrary: fc.integer() },
	{ weight: 2, arbitrary: fc.constantFrom(NaN, Infinity, -Infinity, 0, -0, 1, -1, 1e200, -1e200, 1e-200, 1e308, Number.MAX_VALUE, -Number.MAX_VALUE, Number.MIN_VALUE, Number.MAX_SAFE_INTEGER, 2 ** 53) }
);
/** Values of the size the shop uses, so the working paths are reached too. */
const tame = fc.oneof(fc.double({ min: 0, max: 1000, noNaN: true }), fc.integer({ min: 0, max: 100 }), fc.double({ min: 0, max: 1, noNaN: true }));
const num = fc.oneof(wild, tame);
const int = fc.oneof(fc.integer({ min: -5, max: 60 }), fc.nat(), wild);
const label = fc.constantFrom('The count', 'Rotor mass', 'Scrapped cores');
const text = fc.oneof(fc.string({ maxLength: 20 }), fc.constantFrom('12', '12.5', '-3', '1e400', '999999999.99', '0', '', ' 7 ', '2026-09-01', '2026-02-30', 'abc', '12,5 g'));
const date = fc.oneof(fc.constantFrom('2026-09-01', '2024-02-29', '0000-01-01', '9999-12-31', '2026-13-01', 'x'), fc.date({ noInvalidDate: false }).map((d) => (Number.isNaN(d.getTime()) ? 'bad' : d.toISOString().slice(0, 10))));
const when = fc.oneof(fc.date({ noInvalidDate: false }), date, fc.constantFrom('2026-09-01T08:00:00Z', 'not a time'));
const dateObj = fc.date({ noInvalidDate: false });
const state = fc.oneof(fc.constantFrom(...UNIT_STATES), fc.string({ maxLength: 8 }));
const cx = fc.record({ re: num, im: num });
const polarArb = fc.record({ amount: num, angle: num });
const reading = fc.record({ comp: polarArb, turb: polarArb });
const geometry = fc.record({ bearingCompMm: num, bearingTurbMm: num, centreOfMassMm: num, planeCompMm: num, planeTurbMm: num });
const unit = fc.constantFrom('g', 'mg', 'g_mm', 'mg_mm', 'oz_in', 'furlong');
const spec = fc.record({
	rotorMassKg: num,
	maxServiceRpm: num,
	gradeG: num,
	tighteningFactor: num,
	allocation: fc.constantFrom('symmetric', 'lever', 'other'),
	bearingCompMm: num,
	bearingTurbMm: num,
	centreOfMassMm: num,
	planeCompMm: num,
	planeTurbMm: num,
	radiusCompMm: num,
	radiusTurbMm: num,
	positionsComp: int,
	positionsTurb: int,
	unbalanceUnit: unit,
	correctionMode: fc.constantFrom('add', 'remove', 'both'),
	inducerMm: num,
	exducerMm: num,
	tipSpeedLimitMs: num,
	wastegateMinKpa: fc.option(num),
	wastegateMaxKpa: fc.option(num),
	endPlayMinMm: num,
	endPlayMaxMm: num,
	radialPlayMinMm: num,
	radialPlayMaxMm: num
});
const run = fc.record({
	kind: fc.constantFrom('initial', 'trial', 'check'),
	trialPlane: fc.constantFrom('comp', 'turb', null),
	trialAmount: fc.option(num),
	trialAngle: fc.option(num),
	reading
});
const allocationArb = fc.record({
	reference: fc.constantFrom('correction_planes', 'bearing_planes', 'elsewhere'),
	method: fc.constantFrom('symmetric', 'lever'),
	total: num,
	planes: fc.tuple(fc.record({ key: fc.constant('comp'), label: fc.constant('A'), tolGmm: num, share: num, limited: fc.boolean() }), fc.record({ key: fc.constant('turb'), label: fc.constant('B'), tolGmm: num, share: num, limited: fc.boolean() }))
});
const sample = fc.record({ n: int, defects: int });
const policy = fc.record({ maxFailures: int, windowMs: num, lockMs: num, maxLockMs: num, maxConsecutive: int });
const throttle = fc.option(fc.record({ failures: int, windowStart: num, lockedUntil: num, locks: int, consecutive: int }));
const lotCounts = fc.record({ kind: fc.constantFrom('bearing_kit', 'seal_kit'), lot: fc.string({ maxLength: 6 }), built: int, shipped: int, returned: int, modes: fc.constant([]) });
const quoteLine = fc.record({ kind: fc.constantFrom('part', 'labour'), description: fc.constant('x'), quantityHundredths: int, unitPriceCents: int });
const entries = fc.array(fc.record({ toState: fc.constantFrom(...UNIT_STATES), fromState: fc.constant(null), at: when }), { maxLength: 5 });
const args = (...as: fc.Arbitrary<unknown>[]) => fc.tuple(...as);

// ---- the table -------------------------------------------------------------------------------

type Fn = (...a: any[]) => unknown; // eslint-disable-line @typescript-eslint/no-explicit-any
interface Entry {
	/** Random arguments. */
	args: fc.Arbitrary<unknown[]>;
	/** Arguments that must work (so the property is not passed by throwing every time). */
	example: unknown[];
	/** How to call it, when it is not a plain call (a class). */
	call?: (f: Fn, a: unknown[]) => unknown;
}

const goodSpec = {
	rotorMassKg: 0.42, maxServiceRpm: 180000, gradeG: 6.3, tighteningFactor: 0.4, allocation: 'lever', bearingCompMm: 20, bearingTurbMm: 60,
	centreOfMassMm: 50, planeCompMm: 5, planeTurbMm: 90, radiusCompMm: 18, radiusTurbMm: 20, positionsComp: 0, positionsTurb: 12,
	unbalanceUnit: 'mg', correctionMode: 'remove', inducerMm: 40, exducerMm: 56, tipSpeedLimitMs: 520, wastegateMinKpa: 80, wastegateMaxKpa: 100,
	endPlayMinMm: 0.03, endPlayMaxMm: 0.09, radialPlayMinMm: 0.3, radialPlayMaxMm: 0.6
};
const goodReading = { comp: { amount: 12, angle: 40 }, turb: { amount: 30, angle: 200 } };
const z1 = { re: 3, im: 4 };
const z2 = { re: 1, im: -2 };

const NUMERIC: Record<string, Entry> = {
	// numbers: the checks themselves
	'numbers.ts#shown': { args: args(num), example: [1] },
	'numbers.ts#finite': { args: args(label, num), example: ['x', 1] },
	'numbers.ts#nonNegative': { args: args(label, num), example: ['x', 1] },
	'numbers.ts#positive': { args: args(label, num), example: ['x', 1] },
	'numbers.ts#nonNegativeInt': { args: args(label, num), example: ['x', 1] },
	'numbers.ts#positiveInt': { args: args(label, num), example: ['x', 1] },
	'numbers.ts#safeInt': { args: args(label, num), example: ['x', -1] },
	'numbers.ts#between': { args: args(label, num, num, num), example: ['x', 1, 0, 2] },
	'numbers.ts#fraction': { args: args(label, num), example: ['x', 0.5] },
	'numbers.ts#atMost': { args: args(label, num, label, num), example: ['A', 1, 'B', 2] },
	'numbers.ts#absolutePressure': { args: args(label, num), example: ['x', 101] },
	'numbers.ts#result': { args: args(label, num), example: ['x', 1] },
	'numbers.ts#oneOf': { args: args(label, text, fc.constant(['a', 'b'])), example: ['x', 'a', ['a', 'b']] },
	'numbers.ts#instantMs': { args: args(label, num), example: ['x', 0] },
	'numbers.ts#timeOf': { args: args(label, fc.oneof(when, num)), example: ['x', '2026-09-01'] },
	'numbers.ts#list': { args: args(label, fc.oneof(fc.array(tame), num)), example: ['x', [1]] },
	// stats
	'stats/normal.ts#erfc': { args: args(num), example: [0.5] },
	'stats/normal.ts#normalCdf': { args: args(num), example: [1.96] },
	'stats/normal.ts#normalQuantile': { args: args(num), example: [0.975] },
	'stats/normal.ts#zFor': { args: args(num), example: [0.95] },
	'stats/proportion.ts#wilsonInterval': { args: args(int, int, num), example: [3, 10, 0.95] },
	'stats/proportion.ts#rateWithInterval': { args: args(int, int, num), example: [3, 10, 0.95] },
	'stats/p-chart.ts#pChartLimits': { args: args(num, int, num), example: [0.2313, 50, 3] },
	'stats/p-chart.ts#checkSample': { args: args(sample), example: [{ n: 10, defects: 2 }] },
	'stats/p-chart.ts#pBar': { args: args(fc.array(sample, { maxLength: 5 })), example: [[{ n: 10, defects: 2 }]] },
	'stats/p-chart.ts#pChart': { args: args(fc.array(sample, { maxLength: 5 }), num, fc.oneof(num, fc.constant(null), fc.constant(undefined))), example: [[{ n: 10, defects: 2 }], 3, undefined] },
	'stats/percentile.ts#quantileRanks': { args: args(int, num), example: [10, 0.9] },
	'stats/percentile.ts#interpolate': { args: args(num, num, num), example: [1, 2, 0.5] },
	'stats/percentile.ts#quantile': { args: args(fc.array(num, { maxLength: 6 }), num), example: [[3, 1, 2], 0.5] },
	'stats/percentile.ts#median': { args: args(fc.array(num, { maxLength: 6 })), example: [[3, 1, 2]] },
	'stats/littles-law.ts#littlesLawWip': { args: args(num, num), example: [600, 5] },
	'stats/littles-law.ts#littleCheck': { args: args(num, num, num, num), example: [3100, 600, 5, 0.2] },
	'stats/money.ts#labourCents': { args: args(num, num), example: [45, 6000] },
	'stats/money.ts#costPerGood': { args: args(num, int), example: [45000, 8] },
	'stats/money.ts#formatCents': { args: args(fc.oneof(num, fc.constant(null))), example: [12345] },
	'stats/week.ts#weekStart': { args: args(num), example: [Date.UTC(2026, 11, 1)] },
	// balance
	'balance/complex.ts#checkComplex': { args: args(label, cx), example: ['z', z1] },
	'balance/complex.ts#c': { args: args(num, num), example: [1, 2] },
	'balance/complex.ts#add': { args: args(cx, cx), example: [z1, z2] },
	'balance/complex.ts#sub': { args: args(cx, cx), example: [z1, z2] },
	'balance/complex.ts#mul': { args: args(cx, cx), example: [z1, z2] },
	'balance/complex.ts#neg': { args: args(cx), example: [z1] },
	'balance/complex.ts#scale': { args: args(cx, num), example: [z1, 2] },
	'balance/complex.ts#div': { args: args(cx, cx), example: [z1, z2] },
	'balance/complex.ts#abs': { args: args(cx), example: [z1] },
	'balance/complex.ts#angleOf': { args: args(cx), example: [z1] },
	'balance/complex.ts#polar': { args: args(num, num), example: [2, 30] },
	'balance/complex.ts#toPolar': { args: args(cx), example: [z1] },
	'balance/complex.ts#wrapDeg': { args: args(num), example: [-30] },
	'balance/tolerance.ts#omegaFromRpm': { args: args(num), example: [3000] },
	'balance/tolerance.ts#permissibleUnbalance': { args: args(num, num, num), example: [6.3, 0.42, 180000] },
	'balance/tolerance.ts#specificUnbalance': { args: args(num, num), example: [6.3, 180000] },
	'balance/tolerance.ts#effectiveGrade': { args: args(num, num), example: [6.3, 0.4] },
	'balance/tolerance.ts#toGmm': { args: args(num, unit, num), example: [1, 'oz_in', 0] },
	'balance/tolerance.ts#fromGmm': { args: args(num, unit, num), example: [10, 'mg', 25] },
	'balance/allocation.ts#leverShares': { args: args(num, num, num), example: [0, 100, 40] },
	'balance/allocation.ts#checkGeometry': { args: args(geometry), example: [goodSpec] },
	'balance/allocation.ts#correctionPlanesInboard': { args: args(geometry), example: [goodSpec] },
	'balance/allocation.ts#allocate': { args: args(num, fc.constantFrom('symmetric', 'lever', 'other'), geometry), example: [2, 'lever', goodSpec] },
	'balance/allocation.ts#toBearingPlanes': { args: args(geometry, cx, cx), example: [goodSpec, z1, z2] },
	'balance/allocation.ts#judge': { args: args(allocationArb, geometry, cx, cx), example: [{ reference: 'bearing_planes', method: 'lever', total: 2, planes: [{ key: 'comp', label: 'A', tolGmm: 1, share: 0.5, limited: false }, { key: 'turb', label: 'B', tolGmm: 1, share: 0.5, limited: false }] }, goodSpec, z1, z2] },
	'balance/correction.ts#influence': { args: args(cx, cx, cx), example: [z1, z2, { re: 1, im: 0 }] },
	'balance/correction.ts#singlePlaneCorrection': { args: args(cx, cx, cx), example: [z1, { re: 1, im: 0 }, z2] },
	'balance/correction.ts#influenceMatrix': { args: args(fc.tuple(cx, cx), cx, fc.tuple(cx, cx), cx, fc.tuple(cx, cx)), example: [[z1, z2], { re: 1, im: 0 }, [{ re: 5, im: 4 }, z2], { re: 0, im: 1 }, [z1, { re: 1, im: 3 }]] },
	'balance/correction.ts#solveCorrection': { args: args(fc.tuple(fc.tuple(cx, cx), fc.tuple(cx, cx)), fc.tuple(cx, cx)), example: [[[{ re: 1, im: 0 }, { re: 0, im: 0 }], [{ re: 0, im: 0 }, { re: 1, im: 0 }]], [z1, z2]] },
	'balance/correction.ts#twoPlaneCorrection': { args: args(fc.tuple(cx, cx), cx, fc.tuple(cx, cx), cx, fc.tuple(cx, cx)), example: [[z1, z2], { re: 1, im: 0 }, [{ re: 5, im: 4 }, z2], { re: 0, im: 1 }, [z1, { re: 1, im: 3 }]] },
	'balance/correction.ts#asMode': { args: args(cx, fc.constantFrom('add', 'remove', 'neither')), example: [z1, 'remove'] },
	'balance/correction.ts#splitToPositions': { args: args(num, num, int, num), example: [10, 50, 12, 0] },
	'balance/correction.ts#sumParts': { args: args(fc.array(fc.record({ position: int, angle: num, amount: num }), { maxLength: 3 })), example: [[{ position: 0, angle: 0, amount: 1 }]] },
	'balance/workbench.ts#checkSpec': { args: args(spec), example: [goodSpec] },
	'balance/workbench.ts#checkReading': { args: args(label, reading), example: ['r', goodReading] },
	'balance/workbench.ts#allowance': { args: args(spec), example: [goodSpec] },
	'balance/workbench.ts#influenceFrom': { args: args(fc.array(run, { maxLength: 4 })), example: [[{ kind: 'initial', trialPlane: null, trialAmount: null, trialAngle: null, reading: goodReading }]] },
	'balance/workbench.ts#evaluate': { args: args(spec, fc.array(run, { maxLength: 3 }), reading), example: [goodSpec, [], goodReading] },
	'balance/workbench.ts#inSpecUnit': { args: args(num, spec, fc.constantFrom('comp', 'turb', 'shaft')), example: [2, goodSpec, 'comp'] },
	'balance/spec.ts#geometryOf': { args: args(spec), example: [goodSpec] },
	'balance/assembly.ts#assemblyFindings': { args: args(spec, fc.record({ endPlayMm: num, radialPlayMm: num, wastegatePresetKpa: fc.option(num) })), example: [goodSpec, { endPlayMm: 0.05, radialPlayMm: 0.4, wastegatePresetKpa: 120 }] },
	'balance/csv-map.ts#parseMachineNumber': { args: args(fc.oneof(text, fc.constant(undefined))), example: ['12,5 mg'] },
	'balance/csv-map.ts#readingFromRow': { args: args(fc.record({ a: text, b: text, c: text, d: text }), fc.constant({ compAmount: 'a', compAngle: 'b', turbAmount: 'c', turbAngle: 'd' })), example: [{ a: '1', b: '2', c: '3', d: '400' }, { compAmount: 'a', compAngle: 'b', turbAmount: 'c', turbAngle: 'd' }] },
	// turbo
	'turbo/atmosphere.ts#geopotential': { args: args(num), example: [1000] },
	'turbo/atmosphere.ts#pressureAtAltitude': { args: args(num), example: [1500] },
	'turbo/compressor.ts#psiToKpa': { args: args(num), example: [14.5] },
	'turbo/compressor.ts#kpaToPsi': { args: args(num), example: [100] },
	'turbo/compressor.ts#trim': { args: args(num, num), example: [40, 56] },
	'turbo/compressor.ts#tipSpeed': { args: args(num, num), example: [56, 180000] },
	'turbo/compressor.ts#speedAtTipLimit': { args: args(num, num), example: [56, 520] },
	'turbo/compressor.ts#pressureRatio': { args: args(fc.oneof(num, num.map((x) => -x)), num), example: [100, 101.325] },
	'turbo/compressor.ts#pressureRatioAtAltitude': { args: args(fc.oneof(num, num.map((x) => -x)), num), example: [100, 1500] },
	// plan
	'plan/ses.ts#assertAlpha': { args: args(num), example: [0.3] },
	'plan/ses.ts#ses': { args: args(fc.array(num, { maxLength: 6 }), num), example: [[3, 5, 4], 0.3] },
	'plan/build-plan.ts#completion': { args: args(state), example: ['painted'] },
	'plan/build-plan.ts#equivalentUnits': { args: args(fc.array(fc.record({ state, count: int }), { maxLength: 4 })), example: [[{ state: 'painted', count: 2 }]] },
	'plan/build-plan.ts#weeklyDemand': { args: args(fc.constant(['2026-08-31', '2026-09-07']), fc.array(fc.record({ week: fc.constantFrom('2026-08-31', '2026-09-07', 'x'), quantity: num }), { maxLength: 4 })), example: [['2026-08-31'], [{ week: '2026-08-31', quantity: 3 }]] },
	'plan/build-plan.ts#planModel': {
		args: args(fc.record({ history: fc.array(num, { maxLength: 5 }), alpha: num, finished: num, wip: fc.array(fc.record({ state: fc.constantFrom(...FLOW), count: int }), { maxLength: 3 }), openDue: num })),
		example: [{ history: [3, 4, 5], alpha: 0.3, finished: 1, wip: [{ state: 'painted', count: 2 }], openDue: 2 }]
	},
	'plan/weeks.ts#addDays': { args: args(date, num), example: ['2026-09-01', 6] },
	'plan/weeks.ts#weekStart': { args: args(date), example: ['2026-09-03'] },
	'plan/weeks.ts#isoWeek': { args: args(date), example: ['2009-12-31'] },
	'plan/weeks.ts#pastWeeks': { args: args(date, int), example: ['2026-09-03', 12] },
	'plan/weeks.ts#isDate': { args: args(text), example: ['2026-09-03'] },
	// warranty, lots, quotes, mail
	'warranty/parts-lots.ts#lotAboveShop': { args: args(int, int, fc.oneof(num, fc.constant(null)), num), example: [3, 10, 0.02, 0.95] },
	'warranty/parts-lots.ts#checkLotCounts': { args: args(lotCounts), example: [{ kind: 'seal_kit', lot: 'S1', built: 10, shipped: 8, returned: 2, modes: [] }] },
	'warranty/parts-lots.ts#judgeLots': { args: args(fc.array(lotCounts, { maxLength: 3 }), fc.record({ shipped: int, returned: int })), example: [[{ kind: 'seal_kit', lot: 'S1', built: 10, shipped: 8, returned: 2, modes: [] }], { shipped: 100, returned: 3 }] },
	'lots/lot.ts#parseMoneyToCents': { args: args(text), example: ['45.50'] },
	'lots/lot.ts#formatCents': { args: args(num), example: [4550] },
	'customer/quote.ts#roundDiv': { args: args(int, int), example: [125, 10] },
	'customer/quote.ts#lineCents': { args: args(fc.record({ quantityHundredths: int, unitPriceCents: int })), example: [{ quantityHundredths: 125, unitPriceCents: 4000 }] },
	'customer/quote.ts#taxCents': { args: args(int, int), example: [10000, 825] },
	'customer/quote.ts#quoteTotals': { args: args(fc.array(quoteLine, { maxLength: 3 }), int, int), example: [[{ kind: 'part', description: 'x', quantityHundredths: 100, unitPriceCents: 5000 }], 825, -1500] },
	'customer/quote.ts#parseMoney': { args: args(text), example: ['1,234.50'] },
	'customer/quote.ts#parseQuantity': { args: args(text), example: ['1.25'] },
	'customer/quote.ts#formatMoney': { args: args(num), example: [123450] },
	'customer/quote.ts#formatQuantity': { args: args(num), example: [125] },
	'customer/backoff.ts#retryDelayMs': { args: args(int, fc.oneof(policy.map((p) => ({ baseMs: p.windowMs, capMs: p.lockMs, maxAttempts: p.maxFailures })), fc.constant(undefined))), example: [3] },
	'customer/rate-limit.ts#TokenBucketLimiter': {
		args: args(num, num, num, num),
		example: [5, 1, 1000, 1500],
		call: (Limiter, [capacity, refill, t1, t2]) => {
			const l = new (Limiter as unknown as new (c: unknown, r: unknown) => { take(k: string, t: unknown): unknown })(capacity, refill);
			return [l.take('a', t1), l.take('a', t2), l.take('a', t2)];
		}
	},
	'customer/progress.ts#customerStepIndex': { args: args(state), example: ['painted'] },
	// units
	'units/states.ts#flowIndex': { args: args(state), example: ['painted'] },
	'units/serial.ts#formatSerial': { args: args(num), example: [351] },
	'units/serial.ts#normalizeSerial': { args: args(text), example: ['sy 351'] },
	'units/durations.ts#stateStays': { args: args(entries, num), example: [[{ toState: 'received', at: '2026-09-01T08:00:00Z' }], Date.UTC(2026, 8, 2)] },
	'units/durations.ts#timeInEachState': { args: args(fc.array(fc.record({ state: fc.constantFrom(...UNIT_STATES), from: num, to: fc.option(num), ms: num }), { maxLength: 4 })), example: [[{ state: 'received', from: 0, to: 10, ms: 10 }]] },
	'units/durations.ts#formatDuration': { args: args(num), example: [3 * 3_600_000] },
	'units/stage-time.ts#timeInStates': { args: args(entries, dateObj), example: [[{ toState: 'received', fromState: null, at: '2026-09-01T08:00:00Z' }], new Date('2026-09-02T08:00:00Z')] },
	'units/stage-time.ts#ageMs': { args: args(when, dateObj), example: ['2026-09-01T08:00:00Z', new Date('2026-09-02T08:00:00Z')] },
	'units/stage-time.ts#isOverdue': { args: args(when, dateObj, num), example: ['2026-09-01T08:00:00Z', new Date('2026-09-02T08:00:00Z'), 8] },
	'units/stage-time.ts#formatDuration': { args: args(num), example: [3 * 3_600_000] },
	// sign-in lockout
	'auth/lockout.ts#lockVerdict': { args: args(throttle, num), example: [{ failures: 0, windowStart: 0, lockedUntil: 5000, locks: 1, consecutive: 5 }, 1000] },
	'auth/lockout.ts#lockDuration': { args: args(policy, int), example: [{ maxFailures: 5, windowMs: 900000, lockMs: 900000, maxLockMs: 86400000, maxConsecutive: 100 }, 3] },
	'auth/lockout.ts#afterFailure': { args: args(throttle, num, policy), example: [null, 1000, { maxFailures: 5, windowMs: 900000, lockMs: 900000, maxLockMs: 86400000, maxConsecutive: 100 }] },
	'auth/lockout.ts#lockMessage': { args: args(num), example: [90_000] },
	'auth/lockout.ts#addressAfterSuccess': { args: args(throttle.filter((t) => t !== null)), example: [{ failures: 2, windowStart: 0, lockedUntil: 0, locks: 0, consecutive: 2 }] },
	'numbers.ts#finiteResult': { args: args(label, fc.oneof(num, fc.array(num, { maxLength: 4 }), fc.record({ a: num, b: fc.option(num) }))), example: ['The result', { a: 1, b: null }] },
	// buying decisions
	'buying/checks.ts#checkCount': { args: args(label, num), example: ['Cores', 12] },
	'buying/checks.ts#checkAmount': { args: args(label, num), example: ['Price', 4500] },
	'buying/checks.ts#checkProportion': { args: args(label, int, int), example: ['Scrapped', 3, 10] },
	'buying/checks.ts#checkConfidence': { args: args(num), example: [0.95] },
	'buying/cost-per-good.ts#costPerGood': { args: args(fc.record({ label: fc.constant('A'), priceCents: num, labourCents: num, accepted: int, judged: int }), num), example: [{ label: 'A', priceCents: 4500, labourCents: 1200, accepted: 40, judged: 50 }, 0.95] },
	'buying/newcombe.ts#newcombeDifference': { args: args(int, int, int, int, num), example: [56, 70, 48, 80, 0.95] },
	'buying/newcombe.ts#points': { args: args(num), example: [0.25] },
	'buying/skid.ts#priceSkid': { args: args(fc.record({ label: fc.constant('A'), cores: int, priceCents: num, labourCents: num, accepted: int, judged: int }), num), example: [{ label: 'A', cores: 40, priceCents: 4500, labourCents: 1200, accepted: 40, judged: 50 }, 0.95] },
	// balancer drift
	'drift/balancer.ts#shareOfAllowance': { args: args(num, num), example: [120, 1000] },
	'drift/balancer.ts#planeDrift': { args: args(fc.constantFrom('comp', 'turb'), fc.array(num, { maxLength: 12 }), int), example: ['comp', [0.1, 0.2, 0.15, 0.3], 8] },
	'drift/individuals.ts#checkValues': { args: args(fc.array(num, { maxLength: 8 })), example: [[0.1, 0.2, 0.3]] },
	'drift/individuals.ts#individualsChart': { args: args(fc.array(num, { maxLength: 12 })), example: [[0.1, 0.2, 0.15, 0.3]] },
	'drift/run-rules.ts#runRules': { args: args(fc.array(num, { maxLength: 12 }), num, num), example: [[0.1, 0.2, 0.15, 0.3], 0.2, 0.05] },
	// trend smoothing
	'plan/holt.ts#assertConstant': { args: args(label, num), example: ['α', 0.3] },
	'plan/holt.ts#assertSeries': { args: args(fc.array(num, { maxLength: 8 })), example: [[3, 5, 4]] },
	'plan/holt.ts#holt': { args: args(fc.array(num, { maxLength: 8 }), num, num), example: [[3, 5, 4, 6, 8], 0.3, 0.2] },
	'plan/method-choice.ts#fitHolt': { args: args(fc.array(num, { maxLength: 8 })), example: [[3, 5, 4, 6, 8, 9]] },
	'plan/method-choice.ts#fitSesAlpha': { args: args(fc.array(num, { maxLength: 8 })), example: [[3, 5, 4, 6, 8, 9]] },
	'plan/method-choice.ts#chooseMethod': { args: args(fc.array(num, { maxLength: 8 }), num), example: [[3, 5, 4, 6, 8, 9], 0.3] },
	// teardown form
	'inspection/qualification.ts#parseLabourMinutes': { args: args(fc.oneof(text, fc.constant(null), fc.constant(undefined))), example: ['45'] }
};

/** Modules with no function that computes on quantities: names, states, text and byte parsing. */
const NOT_NUMERIC_MODULES: Record<string, string> = {
	'input/fields.ts': 'form and body field schemas (blank and unknown-key sentences)',
	'input/json.ts': 'bounding and summarising JSON text (depths and lengths of stored text, not quantities)',
	'units/event-data.ts': 'reading stored move data into a safe view',
	'auth/roles.ts': 'role names and groups',
	'cards/card-style.ts': 'card names, shapes and colours',
	'customer/mail-templates.ts': 'e-mail text from facts already formatted',
	'import/csv-table.ts': 'decoding and splitting an uploaded text file (byte offsets, not quantities)',
	'import/map-columns.ts': 'matching column headers to fields',
	'lots/manifest.ts': 'checking manifest rows (tags and model codes)',
	'orders/channels.ts': 'order channel and status names',
	'orders/order-csv.ts': 'order CSV rows; quantities are checked there as whole numbers from text',
	'photos/image-type.ts': 'recognising image files by their first bytes',
	'queue-order.ts': 'ordering cards and units by stored whole-number ranks and dates',
	'units/actions.ts': 'the moves, their roles and data schemas',
	'units/cautions.ts': 'caution sentences per stage',
	'units/customer-guards.ts': 'guards: sentences from facts',
	'units/guards.ts': 'guards: sentences from facts',
	'units/machine.ts': 'the state machine',
	'units/undo.ts': "the state machine's undo rule (times from stored events)",
	'warranty/failure-modes.ts': 'failure mode names'
};

/** Functions in modules that also hold numeric ones, set aside with the reason. */
const NOT_NUMERIC: Record<string, string> = {
	'buying/cost-per-good.ts#rankByUpper': 'orders rows already computed by costPerGood',
	'buying/newcombe.ts#differenceSentence': 'a sentence from a computed difference',
	'buying/skid.ts#compareOffers': 'a sentence from two priced offers',
	'drift/balancer.ts#driftVerdict': 'sentences from planeDrift per plane',
	'plan/plan-with-method.ts#planModelWithMethod': 'the plan for one model from chooseMethod and planModel, both in the table',
	'balance/csv-map.ts#guessMap': 'guesses columns from header words',
	'customer/progress.ts#noticeForMove': 'which e-mail a move sends',
	'inspection/qualification.ts#checkQualification': 'the checklist form; its minutes go through parseLabourMinutes',
	'lots/lot.ts#isCalendarDate': 'a text test',
	'lots/lot.ts#lotFormSchema': 'a form schema',
	'lots/lot.ts#nextLotCode': 'lot codes from text',
	'auth/lockout.ts#lockKey': 'key text',
	'auth/lockout.ts#describeLockKey': 'key text',
	'units/serial.ts#isSerial': 'a text test',
	'units/states.ts#isTerminal': 'a state test',
	'units/states.ts#isUnitState': 'a state test',
	'units/states.ts#isStage': 'a stage test',
	'units/states.ts#nextStage': 'a state lookup',
	'units/states.ts#stateBefore': 'a state lookup'
};

// ---- the checks --------------------------------------------------------------------------

/** What is wrong with a returned value: NaN or an infinity anywhere, or such words in text. */
function problems(v: unknown, path = 'result', seen = new Set<unknown>()): string[] {
	if (typeof v === 'number') return Number.isFinite(v) ? [] : [`${path} is ${v}`];
	if (typeof v === 'string') return /NaN|Infinity|undefined/.test(v) ? [`${path} reads ${JSON.stringify(v.slice(0, 60))}`] : [];
	if (typeof v === 'bigint' || typeof v === 'function' || typeof v === 'symbol') return [`${path} is a ${typeof v}`];
	if (v === null || v === undefined || typeof v === 'boolean') return [];
	if (v instanceof Date) return Number.isFinite(v.getTime()) ? [] : [`${path} is an invalid date`];
	if (seen.has(v)) return [];
	seen.add(v);
	if (v instanceof Map) return [...v.entries()].flatMap(([k, x], i) => [...problems(k, `${path}.key${i}`, seen), ...problems(x, `${path}.value${i}`, seen)]);
	if (Array.isArray(v)) return v.flatMap((x, i) => problems(x, `${path}[${i}]`, seen));
	return Object.entries(v as Record<string, unknown>).flatMap(([k, x]) => problems(x, `${path}.${k}`, seen));
}

type Outcome = 'returned' | 'range-error' | string;
function outcome(f: Fn, e: Entry, a: unknown[]): Outcome {
	let out: unknown;
	try {
		out = e.call ? e.call(f, a) : f(...a);
	} catch (err) {
		if (err instanceof RangeError) return /^[A-Z].*[.?]$/s.test(err.message) ? 'range-error' : `RangeError without a sentence: ${err.message}`;
		return `threw ${err instanceof Error ? `${err.constructor.name}: ${err.message}` : String(err)}`;
	}
	const bad = problems(out);
	return bad.length ? `returned ${bad.slice(0, 3).join('; ')}` : 'returned';
}

const modules: Record<string, Record<string, unknown>> = {};

function domainFiles(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? domainFiles(join(dir, d.name)) : d.name.endsWith('.ts') ? [join(dir, d.name)] : []));
}

beforeAll(async () => {
	for (const file of domainFiles(DOMAIN)) modules[relative(DOMAIN, file).split('\\').join('/')] = await import(file);
});

function resolve(key: string): Fn {
	const [file, name] = key.split('#');
	return modules[file]?.[name] as Fn;
}

describe('every numeric domain function returns finite numbers or throws a RangeError', () => {
	it('the table and the modules agree: every exported function is in the table or set aside with a reason', () => {
		const listed = new Set(Object.keys(NUMERIC).map(resolve));
		const unknownKeys = [...Object.keys(NUMERIC), ...Object.keys(NOT_NUMERIC)].filter((k) => typeof resolve(k) !== 'function');
		expect(unknownKeys, 'table entries that name no exported function').toEqual([]);
		const unknownModules = Object.keys(NOT_NUMERIC_MODULES).filter((m) => !(m in modules));
		expect(unknownModules, 'set-aside modules that do not exist').toEqual([]);
		const unclassified: string[] = [];
		for (const [file, mod] of Object.entries(modules)) {
			if (file in NOT_NUMERIC_MODULES) continue;
			for (const [name, value] of Object.entries(mod)) {
				const key = `${file}#${name}`;
				if (typeof value === 'function' && !listed.has(value as Fn) && !(key in NOT_NUMERIC)) unclassified.push(key);
			}
		}
		expect(unclassified, 'exported functions missing from the numeric table (add them, or set them aside with a reason)').toEqual([]);
	});

	for (const [key, entry] of Object.entries(NUMERIC)) {
		it(key, () => {
			const f = resolve(key);
			expect(typeof f).toBe('function');
			// The working example must return (so the property is not passed by refusing everything).
			expect(outcome(f, entry, entry.example)).toBe('returned');
			fc.assert(
				fc.property(entry.args, (a) => {
					expect(['returned', 'range-error']).toContain(outcome(f, entry, a));
				}),
				{ numRuns: RUNS }
			);
		});
	}
});

