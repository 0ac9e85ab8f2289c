/**
 * Simple (single) exponential smoothing, in the form of the NIST/SEMATECH e-Handbook of
 * Statistical Methods §6.4.3.1: S₂ = y₁ and S_t = α·y_{t−1} + (1 − α)·S_{t−1} for t ≥ 3, so S_t
 * is the forecast of y_t made one period before. The fit error is the mean of the squared
 * one-step errors (y_t − S_t) over t = 2..n; the forecast for the next period is
 * S_{n+1} = α·y_n + (1 − α)·S_n.
 */
import { finite, list, result } from '../numbers';

export interface SesResult {
	/** S_t aligned with the series: smoothed[0] is null (there is no S₁), smoothed[t−1] = S_t. */
	smoothed: (number | null)[];
	/** y_t − S_t for t = 2..n. */
	errors: number[];
	sse: number;
	/** Mean squared error of the fit; null when there are fewer than two observations. */
	mse: number | null;
	/** The forecast for the period after the last; null for an empty series. */
	next: number | null;
}

export function assertAlpha(alpha: number): void {
	finite('The smoothing constant α', alpha);
	if (alpha <= 0 || alpha > 1) throw new RangeError('The smoothing constant α must be above 0 and at most 1.');
}

export function ses(series: readonly number[], alpha: number): SesResult {
	assertAlpha(alpha);
	list<number>('The series', series).forEach((y, i) => finite(`Value ${i + 1} of the series`, y));
	const n = series.length;
	if (n === 0) return { smoothed: [], errors: [], sse: 0, mse: null, next: null };
	const smoothed: (number | null)[] = [null];
	const errors: number[] = [];
	let s = series[0];
	for (let t = 1; t < n; t++) {
		// s is S_{t+1} in the handbook's 1-based numbering: the forecast of series[t].
		smoothed.push(s);
		errors.push(result('A one-step forecast error', series[t] - s));
		s = result('The smoothed value', alpha * series[t] + (1 - alpha) * s);
	}
	const sse = result('The sum of squared errors', errors.reduce((a, e) => a + e * e, 0));
	return { smoothed, errors, sse, mse: errors.length ? sse / errors.length : null, next: s };
}
