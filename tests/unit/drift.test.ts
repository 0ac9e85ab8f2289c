import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { abs, mean, subtract } from 'mathjs';
import jStat from 'jstat';
import { D2, D4, individualsChart } from '../../src/lib/domain/drift/individuals';
import { runRules } from '../../src/lib/domain/drift/run-rules';
import { driftVerdict, shareOfAllowance } from '../../src/lib/domain/drift/balancer';

describe('individuals chart with moving-range limits (NIST/SEMATECH §6.3.2)', () => {
	test('d₂ for two values is E|Z₁ − Z₂| = 2/√π, checked by integrating with jStat\'s normal CDF', () => {
		// E|Z₁ − Z₂| = √2·E|Z| = √2 · 2∫₀^∞ z dΦ(z): a midpoint sum over jStat.normal.cdf (jstat 1.9).
		let e = 0;
		const h = 0.001;
		for (let z = 0; z < 10; z += h) e += (z + h / 2) * (jStat.normal.cdf(z + h, 0, 1) - jStat.normal.cdf(z, 0, 1));
		expect(Math.SQRT2 * 2 * e).toBeCloseTo(D2, 6);
		// The usual table values (Montgomery, Introduction to Statistical Quality Control, Appendix VI; from memory): d₂ = 1.128, 3/d₂ = 2.66, D₄ = 3.267.
		expect(D2).toBeCloseTo(1.128, 3);
		expect(3 / D2).toBeCloseTo(2.66, 2);
		expect(D4).toBeCloseTo(3.267, 3);
	});

	test('centre, MR̄ and limits agree with mathjs (mean, abs, subtract) on random data', () => {
		fc.assert(
			fc.property(fc.array(fc.double({ min: 0, max: 2, noNaN: true }), { minLength: 2, maxLength: 60 }), (xs) => {
				const c = individualsChart(xs)!;
				const mrs = xs.slice(1).map((x, i) => abs(subtract(x, xs[i])) as number);
				const mrBar = mean(mrs) as number;
				const xBar = mean(xs) as number;
				expect(c.centre).toBeCloseTo(xBar, 9);
				expect(c.mrBar).toBeCloseTo(mrBar, 9);
				expect(c.ucl).toBeCloseTo(xBar + (3 * mrBar) / 1.1283791670955126, 9);
				expect(c.lcl).toBeCloseTo(xBar - (3 * mrBar) / 1.1283791670955126, 9);
				expect(c.mrUcl).toBeCloseTo(D4 * mrBar, 9);
			})
		);
	});

	test('a worked set by hand: 0.2, 0.4, 0.3, 0.5 → x̄ = 0.35, MR̄ = 0.5/3, UCL = 0.35 + 3·MR̄/d₂', () => {
		const c = individualsChart([0.2, 0.4, 0.3, 0.5])!;
		expect(c.centre).toBeCloseTo(0.35, 12);
		expect(c.mrBar).toBeCloseTo(0.5 / 3, 12);
		expect(c.ucl).toBeCloseTo(0.35 + (3 * (0.5 / 3)) / (2 / Math.sqrt(Math.PI)), 12);
		expect(c.mr).toEqual([null, expect.closeTo(0.2, 12), expect.closeTo(0.1, 12), expect.closeTo(0.2, 12)]);
		expect(individualsChart([0.3])).toBeNull();
		expect(() => individualsChart([0.1, Number.NaN])).toThrow(/Value 2 of the chart is not a number/);
	});
});

describe('run rules (Western Electric rules as NIST/SEMATECH §6.3.2 lists them; from memory)', () => {
	test('eight in a row above the centre fires at the eighth point, once per stretch', () => {
		const xs = [0, -1, 1, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, -0.2];
		const hits = runRules(xs, 0, 1).filter((h) => h.rule === 'eight-one-side');
		expect(hits).toEqual([{ rule: 'eight-one-side', side: 'above', at: 9, from: 2, to: 11 }]);
	});

	test('seven in a row do not fire; eight below do', () => {
		expect(runRules([0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, -0.1], 0, 1).some((h) => h.rule === 'eight-one-side')).toBe(false);
		expect(runRules(Array(8).fill(-0.1), 0, 1)).toEqual([{ rule: 'eight-one-side', side: 'below', at: 7, from: 0, to: 7 }]);
	});

	test('beyond 3σ, two of three beyond 2σ, four of five beyond 1σ', () => {
		expect(runRules([0, 3.5, 0], 0, 1)).toEqual([{ rule: 'beyond-3s', side: 'above', at: 1, from: 1, to: 1 }]);
		expect(runRules([2.5, 0, 2.1], 0, 1).map((h) => h.rule)).toEqual(['two-of-three-2s']);
		expect(runRules([-1.5, -1.2, 0.5, -1.1, -1.3], 0, 1).map((h) => `${h.rule}:${h.side}`)).toEqual(['four-of-five-1s:below']);
	});
});

describe('the balancer verdict', () => {
	test('share of allowance; bad numbers refused', () => {
		expect(shareOfAllowance(0.3, 1.2)).toBeCloseTo(0.25, 12);
		expect(() => shareOfAllowance(-0.1, 1)).toThrow(/0 or more/);
		expect(() => shareOfAllowance(0.1, 0)).toThrow(/positive number/);
		expect(() => shareOfAllowance(Number.NaN, 1)).toThrow(RangeError);
	});

	test('a creeping residual in one plane is called drift, naming the plane and the first unit of the run', () => {
		const steady = [0.1, 0.12, 0.09, 0.11, 0.1, 0.13, 0.08, 0.1, 0.11, 0.09, 0.1, 0.12];
		const creep = [...steady, 0.14, 0.16, 0.18, 0.2, 0.22, 0.25, 0.27, 0.3];
		const labels = creep.map((_, i) => `SY-${String(i + 1).padStart(5, '0')}`);
		const v = driftVerdict({ comp: [...steady, ...steady.slice(0, 8)], turb: creep }, labels);
		expect(v.drifting).toBe(true);
		expect(v.sentence).toMatch(/^The balancer may be drifting: .* in the turbine plane from SY-000\d\d\./);
		const calm = driftVerdict({ comp: steady, turb: steady });
		expect(calm.drifting).toBe(false);
		expect(calm.sentence).toBe('No drift: the residual shares of the last 12 balanced units break no run rule upward.');
		expect(driftVerdict({ comp: [0.1], turb: [0.1] }).sentence).toMatch(/^Too few balanced units/);
	});
});
