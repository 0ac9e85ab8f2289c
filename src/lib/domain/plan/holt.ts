/**
 * Double exponential smoothing with a trend term, in the form of the NIST/SEMATECH e-Handbook of
 * Statistical Methods §6.4.3.3:
 *   S_t = α·y_t + (1 − α)·(S_{t−1} + b_{t−1})
 *   b_t = γ·(S_t − S_{t−1}) + (1 − γ)·b_{t−1}
 * with S₁ = y₁ and, by default, the handbook's second starting trend
 * b₁ = [(y₂ − y₁) + (y₃ − y₂) + (y₄ − y₃)]/3 (the first, b₁ = y₂ − y₁, when there are fewer than
 * four observations). The forecast of y_t made one period before is F_t = S_{t−1} + b_{t−1};
 * the forecast m periods past the last is S_n + m·b_n.
 */
import { finiteResult } from '../numbers';

export type InitialTrend = 'first-difference' | 'mean-of-three' | number;

export interface HoltResult {
	alpha: number;
	gamma: number;
	/** S_t and b_t aligned with the series (index 0 is t = 1). */
	level: number[];
	trend: number[];
	/** F_t aligned with the series: forecasts[0] is null, forecasts[t−1] = S_{t−1} + b_{t−1}. */
	forecasts: (number | null)[];
	/** y_t − F_t for t = 2..n. */
	errors: number[];
	mse: number | null;
	/** The forecast for the period after the last; null for an empty series. */
	next: number | null;
}

export function assertConstant(name: string, v: number): void {
	if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || v > 1) throw new RangeError(`The smoothing constant ${name} must be between 0 and 1 (got ${String(v)}).`);
}

export function assertSeries(series: readonly number[]): void {
	series.forEach((y, i) => {
		if (typeof y !== 'number' || !Number.isFinite(y)) throw new RangeError(`Week ${i + 1} of the history is not a number (${String(y)}).`);
		if (y < 0) throw new RangeError(`Week ${i + 1} of the history has a negative count (${y}).`);
	});
}

function startTrend(series: readonly number[], initial: InitialTrend): number {
	if (typeof initial === 'number') {
		if (!Number.isFinite(initial)) throw new RangeError(`The starting trend must be a number (got ${initial}).`);
		return initial;
	}
	if (series.length < 2) return 0;
	if (initial === 'mean-of-three' && series.length >= 4) return (series[1] - series[0] + (series[2] - series[1]) + (series[3] - series[2])) / 3;
	return series[1] - series[0];
}

export function holt(series: readonly number[], alpha: number, gamma: number, initial: InitialTrend = 'mean-of-three'): HoltResult {
	assertConstant('α', alpha);
	assertConstant('γ', gamma);
	assertSeries(series);
	const n = series.length;
	if (n === 0) return { alpha, gamma, level: [], trend: [], forecasts: [], errors: [], mse: null, next: null };
	let s = series[0];
	let b = startTrend(series, initial);
	const level = [s];
	const trend = [b];
	const forecasts: (number | null)[] = [null];
	const errors: number[] = [];
	for (let t = 1; t < n; t++) {
		const f = s + b;
		forecasts.push(f);
		errors.push(series[t] - f);
		const sNew = alpha * series[t] + (1 - alpha) * (s + b);
		b = gamma * (sNew - s) + (1 - gamma) * b;
		s = sNew;
		level.push(s);
		trend.push(b);
	}
	const sse = errors.reduce((a, e) => a + e * e, 0);
	return finiteResult('The trend forecast', { alpha, gamma, level, trend, forecasts, errors, mse: errors.length ? sse / errors.length : null, next: s + b });
}
