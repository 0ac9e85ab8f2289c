import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { differenceSentence, newcombeDifference } from '../../src/lib/domain/buying/newcombe';
import { costPerGood, rankByUpper } from '../../src/lib/domain/buying/cost-per-good';
import { compareOffers, priceSkid } from '../../src/lib/domain/buying/skid';
import { wilsonInterval } from '../../src/lib/domain/stats/proportion';

// Source: Newcombe R. G. (1998), "Interval estimation for the difference between independent
// proportions: comparison of eleven methods", Statistics in Medicine 17:873–890, Table II,
// method 10 (hybrid score interval, no continuity correction), to four places.
describe('Newcombe hybrid score interval (Newcombe 1998, Table II, method 10)', () => {
	test.each([
		[56, 70, 48, 80, 0.0524, 0.3339],
		[9, 10, 3, 10, 0.1705, 0.809],
		[5, 56, 0, 29, -0.0381, 0.1926]
	])('%i/%i vs %i/%i → %f to %f', (x1, n1, x2, n2, lo, hi) => {
		const d = newcombeDifference(x1, n1, x2, n2)!;
		expect(d.low).toBeCloseTo(lo, 4);
		expect(d.high).toBeCloseTo(hi, 4);
		expect(d.diff).toBeCloseTo(x1 / n1 - x2 / n2, 12);
	});

	test('swapping the two sides mirrors the interval (from the method\'s definition)', () => {
		fc.assert(
			fc.property(fc.integer({ min: 1, max: 300 }), fc.integer({ min: 1, max: 300 }), fc.nat(), fc.nat(), (n1, n2, a, b) => {
				const x1 = a % (n1 + 1);
				const x2 = b % (n2 + 1);
				const d = newcombeDifference(x1, n1, x2, n2)!;
				const e = newcombeDifference(x2, n2, x1, n1)!;
				expect(d.low).toBeCloseTo(-e.high, 12);
				expect(d.high).toBeCloseTo(-e.low, 12);
				expect(d.low).toBeLessThanOrEqual(d.diff + 1e-12);
				expect(d.high).toBeGreaterThanOrEqual(d.diff - 1e-12);
				expect(d.low).toBeGreaterThanOrEqual(-1);
				expect(d.high).toBeLessThanOrEqual(1);
			})
		);
	});

	test('the sentence claims a difference only when the interval leaves out zero', () => {
		expect(differenceSentence('Ninemile', 'Pellworth', newcombeDifference(56, 70, 48, 80))).toBe(
			'Ninemile scraps more than Pellworth: 5 to 33 points more (95 % interval).'
		);
		expect(differenceSentence('Pellworth', 'Ninemile', newcombeDifference(48, 80, 56, 70))).toBe(
			'Pellworth scraps less than Ninemile: 5 to 33 points less (95 % interval).'
		);
		expect(differenceSentence('Ashgrove', 'Pellworth', newcombeDifference(5, 56, 0, 29))).toBe(
			'Not enough cores to tell Ashgrove and Pellworth apart: the difference runs from 4 points less to 19 points more (95 % interval).'
		);
		expect(newcombeDifference(0, 0, 3, 10)).toBeNull();
		expect(differenceSentence('A', 'B', null)).toMatch(/^Not enough cores to tell/);
	});

	test('bad counts are refused with a sentence', () => {
		expect(() => newcombeDifference(Number.NaN, 10, 1, 10)).toThrow(/must be a number/);
		expect(() => newcombeDifference(1, Infinity, 1, 10)).toThrow(RangeError);
		expect(() => newcombeDifference(-1, 10, 1, 10)).toThrow(/cannot be negative/);
		expect(() => newcombeDifference(11, 10, 1, 10)).toThrow(/more scrapped cores \(11\) than cores judged \(10\)/);
		expect(() => newcombeDifference(1.5, 10, 1, 10)).toThrow(/whole number/);
		expect(() => newcombeDifference(1, 10, 1, 10, 1)).toThrow(/confidence/);
	});
});

describe('cost per good core with its range', () => {
	test('(price + labour) ÷ accept rate, the range from the Wilson bounds (a decreasing transform)', () => {
		// 60 accepted of 80 judged; $40 price + $10 labour per core → $50 / 0.75 = $66.67.
		const c = costPerGood({ priceCents: 4000, labourCents: 1000, accepted: 60, judged: 80 });
		const w = wilsonInterval(60, 80)!;
		expect(c.perCoreCents).toBe(5000);
		expect(c.cents).toBeCloseTo(5000 / 0.75, 9);
		expect(c.lowCents).toBeCloseTo(5000 / w.high, 9);
		expect(c.highCents).toBeCloseTo(5000 / w.low, 9);
		// Wilson 95 % limits of 60/80, written out from Wilson (1927): (p + z²/2n ± z√(p(1−p)/n + z²/4n²)) / (1 + z²/n), z = 1.959964.
		const z = 1.959964;
		const n = 80;
		const p = 0.75;
		const lo = (p + (z * z) / (2 * n) - z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n))) / (1 + (z * z) / n);
		expect(c.highCents).toBeCloseTo(5000 / lo, 3);
	});

	test('no accepted core: no cost; accepted but the lower limit at 0 cannot happen, all accepted gives a finite range', () => {
		const none = costPerGood({ priceCents: 4000, labourCents: 0, accepted: 0, judged: 5 });
		expect(none.cents).toBeNull();
		expect(none.highCents).toBeNull();
		expect(none.lowCents).toBeCloseTo(4000 / wilsonInterval(0, 5)!.high, 9);
		const all = costPerGood({ priceCents: 4000, labourCents: 0, accepted: 5, judged: 5 });
		expect(all.cents).toBe(4000);
		expect(all.lowCents).toBe(4000);
		expect(all.highCents).toBeGreaterThan(4000);
		expect(costPerGood({ priceCents: 1, labourCents: 0, accepted: 0, judged: 0 }).acceptRate).toBeNull();
	});

	test('ranked by the upper end, unbounded last', () => {
		const rows = [
			{ name: 'wide', cost: costPerGood({ priceCents: 3000, labourCents: 0, accepted: 3, judged: 5 }) },
			{ name: 'tight', cost: costPerGood({ priceCents: 3500, labourCents: 0, accepted: 300, judged: 400 }) },
			{ name: 'none', cost: costPerGood({ priceCents: 100, labourCents: 0, accepted: 0, judged: 4 }) }
		];
		expect(rankByUpper(rows).map((r) => r.name)).toEqual(['tight', 'wide', 'none']);
	});

	test('bad money is refused', () => {
		expect(() => costPerGood({ priceCents: -1, labourCents: 0, accepted: 1, judged: 2 })).toThrow(/price per core cannot be negative/);
		expect(() => costPerGood({ priceCents: 1, labourCents: Number.NaN, accepted: 1, judged: 2 })).toThrow(/labour per core must be a number/);
	});
});

describe('the next skid', () => {
	test('expected good cores and their range scale with N; cost per good as the history gives it', () => {
		const q = priceSkid({ label: 'Ninemile', cores: 40, priceCents: 2500, labourCents: 500, accepted: 45, judged: 90 });
		const w = wilsonInterval(45, 90)!;
		expect(q.goodExpected).toBe(20);
		expect(q.goodLow).toBeCloseTo(40 * w.low, 9);
		expect(q.goodHigh).toBeCloseTo(40 * w.high, 9);
		expect(q.outlayCents).toBe(40 * 3000);
		expect(q.cost.cents).toBe(6000);
		expect(() => priceSkid({ label: 'x', cores: 0, priceCents: 1, labourCents: 0, accepted: 1, judged: 1 })).toThrow(/at least one core/);
		expect(() => priceSkid({ label: 'x', cores: -3, priceCents: 1, labourCents: 0, accepted: 1, judged: 1 })).toThrow(/cannot be negative/);
	});

	test('two offers: cheaper only when the ranges do not overlap', () => {
		const cheap = priceSkid({ label: 'Pellworth', cores: 40, priceCents: 4000, labourCents: 500, accepted: 380, judged: 400 });
		const dear = priceSkid({ label: 'Ninemile', cores: 60, priceCents: 2500, labourCents: 500, accepted: 150, judged: 400 });
		expect(compareOffers(cheap, dear)).toMatch(/^Pellworth is cheaper per good core: at most \d+\.\d\d against at least \d+\.\d\d for Ninemile\.$/);
		expect(compareOffers(dear, cheap)).toMatch(/^Pellworth is cheaper per good core/);
		const a = priceSkid({ label: 'Offer A', cores: 10, priceCents: 3000, labourCents: 0, accepted: 6, judged: 10 });
		const b = priceSkid({ label: 'Offer B', cores: 10, priceCents: 3000, labourCents: 0, accepted: 7, judged: 10 });
		expect(compareOffers(a, b)).toMatch(/^Offer B looks cheaper per good core .* the ranges overlap/);
		const none = priceSkid({ label: 'Offer C', cores: 10, priceCents: 3000, labourCents: 0, accepted: 0, judged: 0 });
		expect(compareOffers(a, none)).toBe('No good core on record for Offer C yet: its cost per good core cannot be worked out.');
	});
});
