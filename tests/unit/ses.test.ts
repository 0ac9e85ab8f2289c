import { describe, expect, test } from 'vitest';
import { ses } from '../../src/lib/domain/plan/ses';

// Source: NIST/SEMATECH e-Handbook of Statistical Methods, §6.4.3.1 "Single Exponential
// Smoothing", worked example: series 71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70; α = 0.1;
// S₂ = y₁. The handbook's table lists S₂..S₁₂ rounded to two places, MSE = 19.0 (18.98 unrounded),
// the last observation 70 forecast as 71.7, and the next-period forecast ≈ 71.50.
const NIST = [71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70];
const NIST_S = [71, 70.9, 70.71, 70.44, 69.8, 69.32, 69.58, 70.43, 70.88, 71.29, 71.67];

describe('simple exponential smoothing (NIST/SEMATECH §6.4.3.1 check values)', () => {
	const fit = ses(NIST, 0.1);

	test('smoothed values S₂..S₁₂ match the handbook table to two places', () => {
		expect(fit.smoothed[0]).toBeNull();
		expect(fit.smoothed.length).toBe(12);
		fit.smoothed.slice(1).forEach((s, i) => expect(s).toBeCloseTo(NIST_S[i], 2));
	});

	test('the fit error: MSE ≈ 18.98 over the eleven one-step errors', () => {
		expect(fit.errors.length).toBe(11);
		expect(fit.mse).toBeCloseTo(18.98, 1);
		expect(Math.round(fit.mse! * 10) / 10).toBe(19.0);
	});

	test('the last observation 70 had the forecast 71.7; the next period is ≈ 71.50', () => {
		expect(fit.smoothed[11]).toBeCloseTo(71.67, 2);
		expect(Math.round(fit.smoothed[11]! * 10) / 10).toBe(71.7);
		expect(fit.next).toBeCloseTo(71.5, 2);
	});
});

describe('edges', () => {
	test('an empty series has no forecast; one observation forecasts itself (S₂ = y₁)', () => {
		expect(ses([], 0.3).next).toBeNull();
		const one = ses([5], 0.3);
		expect(one.next).toBe(5);
		expect(one.mse).toBeNull();
	});

	test('α = 1 forecasts the last value (the naive forecast, from the recursion itself)', () => {
		expect(ses([3, 9, 4], 1).next).toBe(4);
	});

	test('α outside (0, 1] is refused', () => {
		expect(() => ses([1, 2], 0)).toThrow(RangeError);
		expect(() => ses([1, 2], 1.5)).toThrow(RangeError);
		expect(() => ses([1, 2], Number.NaN)).toThrow(RangeError);
	});
});
