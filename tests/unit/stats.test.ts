import fc from 'fast-check';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { littleCheck, littlesLawWip } from '../../src/lib/domain/stats/littles-law';
import { labourCents, costPerGood } from '../../src/lib/domain/stats/money';
import { normalCdf, normalQuantile, zFor } from '../../src/lib/domain/stats/normal';
import { pBar, pChart, pChartLimits } from '../../src/lib/domain/stats/p-chart';
import { median, quantile } from '../../src/lib/domain/stats/percentile';
import { wilsonInterval } from '../../src/lib/domain/stats/proportion';
import { weekStart } from '../../src/lib/domain/stats/week';

const r4 = (x: number) => Math.round(x * 10_000) / 10_000;

describe('Wilson score interval', () => {
	// Newcombe RG (1998), "Two-sided confidence intervals for the single proportion: comparison of
	// seven methods", Statistics in Medicine 17:857–872, Table I, method 3 (score, no continuity correction).
	it.each([
		[81, 263, 0.2553, 0.3662],
		[15, 148, 0.0624, 0.1605],
		[0, 20, 0, 0.1611],
		[1, 29, 0.0061, 0.1718]
	])('%i/%i → %f–%f (Newcombe 1998, Table I)', (x, n, low, high) => {
		const ci = wilsonInterval(x, n)!;
		expect(r4(ci.low)).toBe(low);
		expect(r4(ci.high)).toBe(high);
	});

	it('matches the score interval built from jStat’s normal quantile (general-purpose reference)', () => {
		fc.assert(
			fc.property(fc.integer({ min: 1, max: 2000 }), fc.double({ min: 0, max: 1, noNaN: true }), (n, f) => {
				const x = Math.floor(f * n);
				const z = jStat.normal.inv(0.975, 0, 1);
				const p = x / n;
				const c = p + (z * z) / (2 * n);
				const s = z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
				const d = 1 + (z * z) / n;
				const ci = wilsonInterval(x, n)!;
				expect(ci.low).toBeCloseTo(Math.max(0, (c - s) / d), 9);
				expect(ci.high).toBeCloseTo(Math.min(1, (c + s) / d), 9);
				expect(ci.low).toBeLessThanOrEqual(p);
				expect(ci.high).toBeGreaterThanOrEqual(p);
			})
		);
	});

	it('has no interval for an empty lot and refuses impossible counts', () => {
		expect(wilsonInterval(0, 0)).toBeNull();
		expect(() => wilsonInterval(5, 3)).toThrow(RangeError);
	});
});

describe('normal quantile', () => {
	it('gives the 97.5 % point 1.959964 (NIST/SEMATECH e-Handbook §1.3.6.7.1, table of the normal distribution)', () => {
		expect(zFor(0.95)).toBeCloseTo(1.959964, 6);
		expect(normalQuantile(0.5)).toBeCloseTo(0, 12);
	});
	it('agrees with jStat.normal.inv and inverts jStat.normal.cdf (general-purpose reference)', () => {
		fc.assert(
			fc.property(fc.double({ min: 1e-10, max: 1 - 1e-10, noNaN: true }), (p) => {
				expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 6);
				expect(normalCdf(normalQuantile(p))).toBeCloseTo(p, 9);
				expect(normalCdf(normalQuantile(p) / 1)).toBeCloseTo(jStat.normal.cdf(normalQuantile(p), 0, 1), 9);
			})
		);
	});
});

describe('p-chart limits', () => {
	// NIST/SEMATECH e-Handbook of Statistical Methods §6.3.3.2 (p control charts), wafer example:
	// n = 50 per sample, p̄ = 0.2313 → UCL = 0.4102, LCL = 0.0524.
	it('n = 50, p̄ = 0.2313 → UCL 0.4102, LCL 0.0524 (NIST/SEMATECH §6.3.3.2)', () => {
		const lim = pChartLimits(0.2313, 50);
		expect(r4(lim.ucl)).toBe(0.4102);
		expect(r4(lim.lcl)).toBe(0.0524);
	});
	it('per-sample limits widen for small lots, floor the LCL at 0 and flag a lot above its UCL', () => {
		const samples = [
			{ n: 40, defects: 4 },
			{ n: 10, defects: 1 },
			{ n: 30, defects: 18 },
			{ n: 5, defects: 0 }
		];
		const chart = pChart(samples);
		expect(chart.pBar).toBeCloseTo(23 / 85, 12);
		expect(chart.points[1].ucl - chart.points[1].lcl).toBeGreaterThan(chart.points[0].ucl - chart.points[0].lcl);
		expect(chart.points[3].lcl).toBe(0);
		expect(chart.points[2].signal).toBe('above');
		expect(chart.points[0].signal).toBe('within');
		expect(pBar([])).toBeNull();
	});
});

describe('quantiles', () => {
	// Hyndman & Fan (1996), The American Statistician 50(4):361–365, definition 7: for 1..10 the
	// 0.9 quantile is 9.1 and the median 5.5 (h = (n−1)q + 1).
	it('definition 7 on 1..10 (Hyndman & Fan 1996)', () => {
		const xs = [3, 1, 4, 10, 5, 9, 2, 6, 8, 7];
		expect(quantile(xs, 0.9)).toBeCloseTo(9.1, 12);
		expect(median(xs)).toBe(5.5);
		expect(median([])).toBeNull();
	});
	it('agrees with jStat.median and jStat.quantiles (general-purpose reference)', () => {
		fc.assert(
			fc.property(fc.array(fc.integer({ min: 0, max: 10_000 }), { minLength: 2, maxLength: 60 }), fc.double({ min: 0, max: 1, noNaN: true }), (xs, q) => {
				expect(median(xs)).toBeCloseTo(jStat.median(xs), 9);
				// jStat.quantiles with alphap = betap = 1 is Hyndman & Fan definition 7.
				expect(quantile(xs, q)!).toBeCloseTo(jStat.quantiles(xs, [q], 1, 1)[0], 6);
			})
		);
	});
});

describe("Little's law", () => {
	// Little JDC (1961), "A proof for the queuing formula L = λW", Operations Research 9(3):383–387.
	it('throughput 600 per period × cycle time 5 periods → WIP 3000 (Little 1961)', () => {
		expect(littlesLawWip(600, 5)).toBe(3000);
		const ok = littleCheck(3100, 600, 5);
		expect(ok.agrees).toBe(true);
		expect(ok.relativeGap).toBeCloseTo(0.0333, 4);
		expect(littleCheck(5000, 600, 5).agrees).toBe(false);
	});
});

describe('money and weeks', () => {
	it('labour at an hourly rate, cost per good core (arithmetic)', () => {
		expect(labourCents(45, 6000)).toBe(4500);
		expect(labourCents(1, 6100)).toBe(102); // 101.67 → 102
		expect(costPerGood(10 * 4500, 8)).toBe(5625);
		expect(costPerGood(1000, 0)).toBeNull();
	});
	it('weeks start on Monday, ISO 8601 (2026-12-01 is a Tuesday)', () => {
		expect(weekStart(Date.UTC(2026, 11, 1, 12))).toBe('2026-11-30');
		expect(weekStart(Date.UTC(2026, 10, 30, 0))).toBe('2026-11-30');
		expect(weekStart(Date.UTC(2026, 11, 6, 23, 59))).toBe('2026-11-30');
	});
});

describe('p-chart against a standard centre line', () => {
	it('uses the given p̄ for the limits (NIST/SEMATECH §6.3.3.2 limits with a known standard)', () => {
		const chart = pChart([{ n: 50, defects: 25 }], 3, 0.2313);
		expect(r4(chart.points[0].ucl)).toBe(0.4102);
		expect(chart.points[0].signal).toBe('above');
		expect(chart.pBar).toBe(0.2313);
	});
});
