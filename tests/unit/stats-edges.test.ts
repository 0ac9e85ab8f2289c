/**
 * Edges of the report statistics that the main check values (tests/unit/stats.test.ts) leave
 * open: exact boundaries, empty and degenerate inputs, refusals. Found by mutation testing
 * (docs/mutation.md).
 */
import { describe, expect, test } from 'vitest';
import { littleCheck } from '../../src/lib/domain/stats/littles-law';
import { formatCents } from '../../src/lib/domain/stats/money';
import { normalCdf, normalQuantile } from '../../src/lib/domain/stats/normal';
import { pChart, pChartLimits } from '../../src/lib/domain/stats/p-chart';
import { quantile, quantileRanks } from '../../src/lib/domain/stats/percentile';
import { wilsonInterval } from '../../src/lib/domain/stats/proportion';

describe('money', () => {
	test('cents are shown as dollars with two decimals and thousands commas (en-US number format, ECMA-402)', () => {
		expect(formatCents(123456)).toBe('1,234.56');
		expect(formatCents(5)).toBe('0.05');
		expect(formatCents(-250)).toBe('-2.50');
		expect(formatCents(0)).toBe('0.00');
	});

	test('no amount is a dash, not "NaN" or "0.00"', () => {
		expect([null, undefined, Number.NaN, Infinity, -Infinity].map(formatCents)).toEqual(['—', '—', '—', '—', '—']);
	});
});

describe("Little's law check", () => {
	test('nothing predicted: agrees only when nothing was measured either', () => {
		expect(littleCheck(0, 0, 5)).toEqual({ measured: 0, predicted: 0, relativeGap: null, agrees: true });
		expect(littleCheck(2, 3, 0)).toEqual({ measured: 2, predicted: 0, relativeGap: null, agrees: false });
	});

	test('a gap exactly at the tolerance still agrees (the tolerance is inclusive)', () => {
		// 1.25 / 1 − 1 = 0.25 exactly in binary floating point
		expect(littleCheck(1.25, 1, 1, 0.25)).toEqual({ measured: 1.25, predicted: 1, relativeGap: 0.25, agrees: true });
		expect(littleCheck(1.5, 1, 1, 0.25).agrees).toBe(false);
	});
});

describe('normal quantile', () => {
	test('p = 0 and p = 1 (the infinite ends) and anything outside (0, 1) are refused: the quantile is always finite', () => {
		for (const p of [0, 1, -0.1, 1.1, Number.NaN]) expect(() => normalQuantile(p), String(p)).toThrow(RangeError);
		expect(Number.isFinite(normalQuantile(Number.MIN_VALUE))).toBe(true);
	});

	test('after the Halley step the quantile inverts Φ to a relative 1e-12, also in the far tails and at the branch points', () => {
		// Acklam's approximation alone has a relative error up to 1.15e-9; its branch points are p = 0.02425 and 1 − 0.02425.
		// Φ here is erfc, checked against jStat.normal.cdf in stats.test.ts.
		for (const p of [1e-12, 1e-6, 0.001, 0.02424, 0.02425, 0.02426, 0.3, 0.97574, 0.97575, 0.97576, 0.999]) {
			const back = normalCdf(normalQuantile(p));
			expect(Math.abs(back - p) / p, String(p)).toBeLessThan(1e-12);
		}
	});
});

describe('p-chart edges', () => {
	test('an empty sample has no limits: it is refused, not drawn at 0/0', () => {
		expect(() => pChartLimits(0, 0)).toThrow(RangeError);
		expect(() => pChartLimits(0.2, 0)).toThrow(RangeError);
		expect(pChartLimits(0, 1)).toEqual({ centre: 0, lcl: 0, ucl: 0 });
	});

	test('a point on a limit is within; only beyond it is a signal (NIST/SEMATECH e-Handbook §6.3.3.2: points outside the limits)', () => {
		// p̄ = 0.5, n = 36: σ = √(0.25/36) = 1/12, 3σ = 0.25, limits 0.25 and 0.75 (exact in binary)
		expect(pChartLimits(0.5, 36)).toEqual({ centre: 0.5, lcl: 0.25, ucl: 0.75 });
		const { points } = pChart(
			[
				{ n: 36, defects: 27 },
				{ n: 36, defects: 9 },
				{ n: 36, defects: 28 },
				{ n: 36, defects: 8 }
			],
			3,
			0.5
		);
		expect(points.map((p) => p.signal)).toEqual(['within', 'within', 'above', 'below']);
	});

	test('a sample with nothing judged, or no centre line at all, has no signal', () => {
		expect(pChart([{ n: 0, defects: 0 }], 3, 0.1).points).toEqual([{ centre: 0.1, lcl: 0, ucl: 1, p: null, signal: 'none' }]);
		expect(pChart([{ n: 0, defects: 0 }]).points).toEqual([{ centre: 0, lcl: 0, ucl: 1, p: null, signal: 'none' }]);
		expect(pChart([{ n: 10, defects: 1 }], 3, null).points).toEqual([{ centre: 0, lcl: 0, ucl: 1, p: null, signal: 'none' }]);
	});
});

describe('quantile edges', () => {
	test('q = 0 and q = 1 are the smallest and largest values (Hyndman & Fan definition 7)', () => {
		expect(quantileRanks(4, 0)).toEqual({ lo: 1, hi: 2, weight: 0 });
		expect(quantileRanks(4, 1)).toEqual({ lo: 4, hi: 4, weight: 0 });
		expect([quantile([3, 1, 2], 0), quantile([3, 1, 2], 1)]).toEqual([1, 3]);
	});

	test('an empty sample or q outside [0, 1] is refused', () => {
		expect(() => quantileRanks(0, 0.5)).toThrow(RangeError);
		for (const q of [-0.01, 1.01, Number.NaN]) expect(() => quantileRanks(3, q), String(q)).toThrow(RangeError);
	});
});

describe('Wilson interval edges', () => {
	test('all successes: the upper limit is exactly 1, even where the formula rounds to just under 1 (Newcombe 1998, method 3)', () => {
		// at n = 5, 95 %: (centre + spread) / denom evaluates to 0.9999999999999999 in floating point
		expect(wilsonInterval(5, 5)?.high).toBe(1);
		expect(wilsonInterval(0, 5)?.low).toBe(0);
	});

	test('counts that are not 0 ≤ successes ≤ n as integers are refused', () => {
		for (const [s, n] of [
			[-1, 5],
			[6, 5],
			[1.5, 5],
			[1, 5.5],
			[0, -1]
		]) {
			expect(() => wilsonInterval(s, n), `${s}/${n}`).toThrow(RangeError);
		}
		expect(wilsonInterval(0, 0)).toBeNull();
	});
});
