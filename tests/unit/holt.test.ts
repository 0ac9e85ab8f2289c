import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { holt } from '../../src/lib/domain/plan/holt';
import { chooseMethod, fitHolt } from '../../src/lib/domain/plan/method-choice';

// Source: NIST/SEMATECH e-Handbook of Statistical Methods, §6.4.3.3 "Double Exponential
// Smoothing": S_t = α·y_t + (1 − α)(S_{t−1} + b_{t−1}), b_t = γ(S_t − S_{t−1}) + (1 − γ)b_{t−1},
// S₁ = y₁, b₁ = [(y₂ − y₁) + (y₃ − y₂) + (y₄ − y₃)]/3, one-period-ahead forecast S_{t−1} + b_{t−1}.
// The worked example's series, α = 0.3623, γ = 1.0 and b₁ = 0.8 are recalled from memory; the
// handbook's table values are not copied here. The check values below come from a reference
// computation written out plainly from the two equations (a different loop from the code under
// test), and b₁ = 0.8 and the first forecast 7.2 follow from the series by hand.
const EXAMPLE = [6.4, 5.6, 7.8, 8.8, 11, 11.6, 16.7, 15.3, 21.6, 22.4];

function reference(y: number[], a: number, g: number, b1: number) {
	const S: number[] = [y[0]];
	const B: number[] = [b1];
	const F: number[] = [];
	for (let k = 1; k < y.length; k++) {
		F[k] = S[k - 1] + B[k - 1];
		S[k] = a * y[k] + (1 - a) * (S[k - 1] + B[k - 1]);
		B[k] = g * (S[k] - S[k - 1]) + (1 - g) * B[k - 1];
	}
	let sum = 0;
	for (let k = 1; k < y.length; k++) sum += (y[k] - F[k]) ** 2;
	return { S, B, F, mse: sum / (y.length - 1), next: S[y.length - 1] + B[y.length - 1] };
}

describe('double exponential smoothing (NIST/SEMATECH §6.4.3.3 equations)', () => {
	const fit = holt(EXAMPLE, 0.3623, 1.0);
	const ref = reference(EXAMPLE, 0.3623, 1.0, 0.8);

	test('b₁ = (y₄ − y₁)/3 = 0.8 and the first forecast S₁ + b₁ = 7.2 (by hand)', () => {
		expect(fit.trend[0]).toBeCloseTo(0.8, 12);
		expect(fit.forecasts[1]).toBeCloseTo(7.2, 12);
	});

	test('every S_t, b_t and forecast equals the plainly written reference computation', () => {
		EXAMPLE.forEach((_, t) => {
			expect(fit.level[t]).toBeCloseTo(ref.S[t], 10);
			expect(fit.trend[t]).toBeCloseTo(ref.B[t], 10);
		});
		for (let t = 1; t < EXAMPLE.length; t++) expect(fit.forecasts[t]).toBeCloseTo(ref.F[t], 10);
		expect(fit.mse).toBeCloseTo(ref.mse, 10);
		expect(fit.next).toBeCloseTo(ref.next, 10);
		// The reference's values, written down so a change to either shows: MSE over the nine one-step errors.
		expect(ref.mse).toBeCloseTo(3.6743, 4);
		expect(ref.next).toBeCloseTo(25.7719, 4);
	});

	test('a straight line with its own slope as the starting trend is forecast exactly, for any α, γ (from the equations)', () => {
		fc.assert(
			fc.property(fc.double({ min: 0.01, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), fc.integer({ min: 0, max: 50 }), fc.integer({ min: 0, max: 9 }), (a, g, c, m) => {
				const line = Array.from({ length: 10 }, (_, i) => c + m * i);
				const r = holt(line, a, g);
				r.errors.forEach((e) => expect(Math.abs(e)).toBeLessThan(1e-9));
				expect(r.next).toBeCloseTo(c + m * 10, 9);
			})
		);
	});

	test('the starting trend: y₂ − y₁ on request or for short series; a given number', () => {
		expect(holt([1, 4, 5, 9], 0.5, 0.5, 'first-difference').trend[0]).toBe(3);
		expect(holt([1, 4, 5], 0.5, 0.5).trend[0]).toBe(3);
		expect(holt([1, 4, 5, 9], 0.5, 0.5, 2.5).trend[0]).toBe(2.5);
		expect(holt([], 0.5, 0.5).next).toBeNull();
		expect(holt([7], 0.5, 0.5).next).toBe(7);
	});

	test('bad input is refused with a sentence', () => {
		expect(() => holt([1, 2], 1.2, 0.5)).toThrow(/α must be between 0 and 1/);
		expect(() => holt([1, 2], 0.5, Number.NaN)).toThrow(/γ must be between 0 and 1/);
		expect(() => holt([1, Number.POSITIVE_INFINITY], 0.5, 0.5)).toThrow(/Week 2 of the history is not a number/);
		expect(() => holt([1, -2], 0.5, 0.5)).toThrow(/negative count/);
	});
});

describe('choosing the method and its constants', () => {
	test('the fitted constants minimise the scored error: no grid point nearby does better', () => {
		const ramp = [0, 1, 1, 2, 4, 5, 6, 8, 9, 11, 12, 14];
		const best = fitHolt(ramp);
		const err = (a: number, g: number) => {
			const f = holt(ramp, a, g).forecasts;
			let s = 0;
			for (let i = 4; i < ramp.length; i++) s += (ramp[i] - f[i]!) ** 2;
			return s / (ramp.length - 4);
		};
		const e0 = err(best.alpha, best.gamma);
		for (let a = 0.05; a <= 1; a += 0.05) for (let g = 0; g <= 1; g += 0.05) expect(err(a, g)).toBeGreaterThanOrEqual(e0 - 1e-9);
	});

	test('a ramping model is planned with the trend method, its constants and error shown', () => {
		const ramp = [0, 1, 1, 2, 4, 5, 6, 8, 9, 11, 12, 14];
		const c = chooseMethod(ramp, 0.3);
		expect(c.method).toBe('trend');
		expect(c.trend!.alpha).toBeGreaterThan(0);
		expect(c.forecast).toBe(c.trend!.next);
		expect(c.forecast).toBeGreaterThan(14);
		expect(c.trust).toBe(c.trend!.mae);
		expect(c.why).toMatch(/^Trend smoothing follows this model better: .* off by [\d.]+ units a week on average, single smoothing's by [\d.]+ at best\.$/);
	});

	test('the NIST §6.4.3.1 series (no trend) stays with single smoothing at the owner\'s α', () => {
		const c = chooseMethod([71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70], 0.1);
		expect(c.method).toBe('single');
		expect(c.forecast).toBeCloseTo(71.5, 2); // the handbook's next-period forecast at α = 0.1
		expect(c.bestSingle.alpha).toBe(1);
		expect(c.scoredWeeks).toBe(8);
	});

	test('short histories use single smoothing and say why; trust is the mean absolute error of past forecasts', () => {
		const c = chooseMethod([3, 4, 6, 7, 9], 0.5);
		expect(c.method).toBe('single');
		expect(c.trend).toBeNull();
		expect(c.why).toMatch(/too few to fit a trend/);
		// week 5 forecast by single smoothing at α = 0.5 from 3, 4, 6, 7: S = 3 → 3.5 → 4.75 → 5.875; |9 − 5.875| = 3.125
		expect(c.trust).toBeCloseTo(3.125, 12);
	});
});
