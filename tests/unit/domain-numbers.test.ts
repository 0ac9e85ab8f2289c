/**
 * Meaningless inputs are refused with a sentence, and the balancing arithmetic scales before it
 * divides so that very large (or very small) readings give the right answer, checked against
 * mathjs complex numbers and lusolve (a general-purpose reference library).
 */
import fc from 'fast-check';
import { complex, divide, lusolve, multiply, subtract, unaryMinus, type Complex as MComplex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { toBearingPlanes } from '../../src/lib/domain/balance/allocation';
import { abs, div, polar, scale, type Complex } from '../../src/lib/domain/balance/complex';
import { singlePlaneCorrection, twoPlaneCorrection } from '../../src/lib/domain/balance/correction';
import { atMost, nonNegativeInt } from '../../src/lib/domain/numbers';
import { MIN_EXPECTED_DEFECTS, pBar, pChart } from '../../src/lib/domain/stats/p-chart';
import { wilsonInterval } from '../../src/lib/domain/stats/proportion';
import { interpolate } from '../../src/lib/domain/stats/percentile';
import { pressureRatio } from '../../src/lib/domain/turbo/compressor';
import { tipSpeed } from '../../src/lib/domain/turbo/compressor';
import { lotAboveShop } from '../../src/lib/domain/warranty/parts-lots';
import { quoteTotals } from '../../src/lib/domain/customer/quote';

const toM = (z: Complex): MComplex => complex(z.re, z.im);
/** |a − b| / |b| below tol, with b from mathjs (which may hand back a plain number). */
const relClose = (a: Complex, ref: MComplex | number, tol = 1e-12) => {
	const b = complex(ref as MComplex);
	expect(Number.isFinite(a.re) && Number.isFinite(a.im)).toBe(true);
	expect(Math.hypot(a.re - b.re, a.im - b.im) / Math.hypot(b.re, b.im)).toBeLessThan(tol);
};

describe('refusals are sentences', () => {
	it('a p-chart sample with more scrapped than judged', () => {
		expect(() => pBar([{ n: 10, defects: 12 }])).toThrow(new RangeError('Scrapped cores (12) cannot exceed cores judged (10).'));
		expect(() => pChart([{ n: 10, defects: 12 }], 3, 0.1)).toThrow(RangeError);
		expect(() => pBar([{ n: -1, defects: 0 }])).toThrow(/Cores judged must be a whole number of 0 or more \(got -1\)\./);
		expect(() => pBar([{ n: Number.NaN, defects: 0 }])).toThrow(/Cores judged must be a number \(got not a number\)\./);
	});
	it('counts, intervals, pressures and speeds', () => {
		expect(() => wilsonInterval(5, 3)).toThrow(new RangeError('The count (5) cannot exceed the number of trials (3).'));
		expect(() => lotAboveShop(4, 2, 0.1)).toThrow(new RangeError('Returned units (4) cannot exceed units shipped (2).'));
		expect(() => nonNegativeInt('Cores judged', 2.5)).toThrow(new RangeError('Cores judged must be a whole number of 0 or more (got 2.5).'));
		expect(() => atMost('Scrapped cores', 12, 'Cores judged', 10)).toThrow(new RangeError('Scrapped cores (12) cannot exceed cores judged (10).'));
		expect(() => pressureRatio(-120, 101.325)).toThrow(/at or below a full vacuum/);
		expect(() => pressureRatio(50, 0)).toThrow(new RangeError('An ambient pressure of 0 kPa absolute is at or below a full vacuum.'));
		expect(() => tipSpeed(56, -1000)).toThrow(new RangeError('The shaft speed cannot be negative (got -1000).'));
		expect(() => div(polar(1, 0), polar(0, 0))).toThrow(new RangeError('Cannot divide by a zero vector.'));
	});
	it('a quote whose total does not fit in whole cents is refused, not rounded', () => {
		const huge = { kind: 'part' as const, description: 'x', quantityHundredths: 99_999_999, unitPriceCents: 99_999_999_999 };
		expect(() => quoteTotals([huge], 0)).toThrow(RangeError);
	});
});

describe('p-chart: a lot too small for its limits is too few to judge', () => {
	// The n·p̄ ≥ 1 floor is common practice; textbook normal-approximation rules ask for more
	// (n·p ≥ 5 and others, compared by Emura & Lin 2015, Quality and Reliability Engineering
	// International 31(3):411–418).
	it('n·p̄ < 1 → too_few whatever the lot scrapped; n·p̄ ≥ 1 → judged against the limits', () => {
		expect(MIN_EXPECTED_DEFECTS).toBe(1);
		const chart = pChart(
			[
				{ n: 10, defects: 0 }, // 10 × 0.05 = 0.5
				{ n: 10, defects: 3 }, // would be "above" its 3-sigma limit (0.257), yet 0.5 expected
				{ n: 20, defects: 1 }, // 20 × 0.05 = 1: judged
				{ n: 200, defects: 40 } // judged, above
			],
			3,
			0.05
		);
		expect(chart.points.map((p) => p.signal)).toEqual(['too_few', 'too_few', 'within', 'above']);
		// the limits are still reported for the chart's line
		expect(chart.points[0].ucl).toBeCloseTo(0.05 + 3 * Math.sqrt((0.05 * 0.95) / 10), 12);
	});
	it('property: too_few exactly when n·p̄ < 1 for a lot with verdicts', () => {
		fc.assert(
			fc.property(fc.array(fc.record({ n: fc.integer({ min: 0, max: 80 }), d: fc.nat() }), { minLength: 1, maxLength: 8 }), (raw) => {
				const samples = raw.map((s) => ({ n: s.n, defects: s.n ? s.d % (s.n + 1) : 0 }));
				const chart = pChart(samples);
				const centre = chart.pBar;
				const expected = samples.map((s) => (centre === null || s.n === 0 ? 'none' : s.n * centre < 1 ? 'too_few' : 'judged'));
				expect(chart.points.map((p) => (p.signal === 'none' || p.signal === 'too_few' ? p.signal : 'judged'))).toEqual(expected);
			})
		);
	});
});

describe('very large and very small readings give the right answer (mathjs as the reference)', () => {
	const big = fc.record({ amount: fc.double({ min: 0.05, max: 500, noNaN: true }), angle: fc.double({ min: 0, max: 359.999, noNaN: true }) });
	for (const k of [1e200, 1e-200, 1e150]) {
		it(`complex division at ×${k} equals mathjs divide`, () => {
			// Source: mathjs complex division (complex.js, Smith's method) as the reference.
			fc.assert(
				fc.property(big, big, (p, q) => {
					const a = scale(polar(p.amount, p.angle), k);
					const b = scale(polar(q.amount, q.angle), k);
					relClose(div(a, b), divide(toM(a), toM(b)) as MComplex);
					relClose(div(a, polar(q.amount, q.angle)), divide(toM(a), complex(polar(q.amount, q.angle).re, polar(q.amount, q.angle).im)) as MComplex);
				}),
				{ numRuns: 200 }
			);
		});
	}
	it('the naive |b|² formula would overflow at 1e200; Smith gives 1+0i (mathjs)', () => {
		const a = { re: 1e200, im: 1e200 };
		// The naive formula divides by |b|² = 2e400 = Infinity here.
		expect(a.re * a.re + a.im * a.im).toBe(Infinity);
		relClose(div(a, a), divide(toM(a), toM(a)) as MComplex);
		expect(abs({ re: 3e200, im: 4e200 })).toBeCloseTo(5e200, -188); // Math.hypot, no overflow of re² + im²
	});
	it('single-plane correction with readings ×1e200 equals mathjs −R0·T/(R1−R0)', () => {
		// Source: mathjs complex arithmetic as the reference.
		fc.assert(
			fc.property(big, big, big, (r0, t, r1) => {
				const R0 = scale(polar(r0.amount, r0.angle), 1e200);
				const T = polar(t.amount, t.angle);
				const R1 = scale(polar(r1.amount, r1.angle), 1e200);
				fc.pre(abs(scale(R1, 1e-200)) > 0 && Math.hypot((R1.re - R0.re) / 1e200, (R1.im - R0.im) / 1e200) > 1e-3);
				const ref = divide(multiply(unaryMinus(toM(R0)), toM(T)), subtract(toM(R1), toM(R0))) as MComplex;
				relClose(singlePlaneCorrection(R0, T, R1), ref, 1e-9);
			}),
			{ numRuns: 200 }
		);
	});
	it('two-plane correction with readings ×1e200 equals mathjs lusolve(H, −R0)', () => {
		// Source: mathjs lusolve on the complex influence matrix as the reference.
		fc.assert(
			fc.property(fc.array(big, { minLength: 8, maxLength: 8 }), (v) => {
				const z = v.map((p, i) => (i === 2 || i === 3 ? polar(p.amount, p.angle) : scale(polar(p.amount, p.angle), 1e200)));
				const [a0, b0, t1, t2, a1, b1, a2, b2] = z;
				const h = [
					[divide(subtract(toM(a1), toM(a0)), toM(t1)), divide(subtract(toM(a2), toM(a0)), toM(t2))],
					[divide(subtract(toM(b1), toM(b0)), toM(t1)), divide(subtract(toM(b2), toM(b0)), toM(t2))]
				] as MComplex[][];
				// Well-conditioned only (checked on H / 1e200, whose products do not overflow).
				const hs = h.map((row) => row.map((x) => divide(x, 1e200) as MComplex));
				const det = subtract(multiply(hs[0][0], hs[1][1]), multiply(hs[0][1], hs[1][0])) as MComplex;
				const normH = Math.max(...hs.flat().map((x) => Math.hypot(x.re, x.im)));
				fc.pre(Math.hypot(det.re, det.im) > 1e-3 * normH * normH);
				const ref = lusolve(h, [[unaryMinus(toM(a0))], [unaryMinus(toM(b0))]]) as unknown as MComplex[][];
				const [w1, w2] = twoPlaneCorrection([a0, b0], t1, [a1, b1], t2, [a2, b2]);
				// The solution is about 1 (readings / influence): compare against the larger part.
				const scaleRef = Math.max(1, ...ref.map(([x]) => Math.hypot(complex(x).re, complex(x).im)));
				expect(Math.hypot(w1.re - complex(ref[0][0]).re, w1.im - complex(ref[0][0]).im) / scaleRef).toBeLessThan(1e-6);
				expect(Math.hypot(w2.re - complex(ref[1][0]).re, w2.im - complex(ref[1][0]).im) / scaleRef).toBeLessThan(1e-6);
			}),
			{ numRuns: 200 }
		);
	});
	it('bearing planes at positions near the double range keep force and moment (statics)', () => {
		// Arithmetic: U1 + U2 = UA + UB for any positions; positions ±1e308 overflow a plain difference.
		const g = { bearingCompMm: -1e308, bearingTurbMm: 1e308, centreOfMassMm: 0, planeCompMm: -1.5e308, planeTurbMm: 1.2e308 };
		const [u1, u2] = toBearingPlanes(g, polar(2, 30), polar(1, 200));
		const sum = { re: u1.re + u2.re, im: u1.im + u2.im };
		const ref = { re: polar(2, 30).re + polar(1, 200).re, im: polar(2, 30).im + polar(1, 200).im };
		expect(Math.hypot(sum.re - ref.re, sum.im - ref.im)).toBeLessThan(1e-12);
	});
	it('interpolation between order statistics of opposite sign near the double range', () => {
		// Hyndman & Fan definition 7 is a weighted mean: halfway between −1.5e308 and 1.5e308 is 0.
		expect(interpolate(-1.5e308, 1.5e308, 0.5)).toBe(0);
		expect(interpolate(1, 2, 0.25)).toBe(1.25);
	});
});
