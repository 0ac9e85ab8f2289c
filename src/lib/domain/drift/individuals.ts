/**
 * The individuals chart with moving-range limits (NIST/SEMATECH e-Handbook of Statistical
 * Methods §6.3.2, "individuals control charts"): for values x₁ … x_n in time order,
 *   MR_i = |x_i − x_{i−1}| (i = 2..n), MR̄ = their mean, x̄ = the mean of the values,
 *   limits x̄ ± 3·MR̄/d₂ with d₂ = 2/√π ≈ 1.128 (the expected range of two normal values in
 *   units of σ), and the moving-range chart's upper limit D₄·MR̄ with D₄ = 1 + 3·d₃/d₂ ≈ 3.267.
 */
import { finiteResult } from '../numbers';
export const D2 = 2 / Math.sqrt(Math.PI);
/** d₃ for subgroups of two: the standard deviation of the range of two normal values, in σ: √(2 − 4/π) ≈ 0.853. */
export const D3 = Math.sqrt(2 - 4 / Math.PI);
export const D4 = 1 + (3 * D3) / D2;

export interface IndividualsChart {
	centre: number;
	mrBar: number;
	/** σ estimated as MR̄/d₂. */
	sigma: number;
	ucl: number;
	lcl: number;
	mrUcl: number;
	/** Moving ranges aligned with the values: mr[0] is null. */
	mr: (number | null)[];
}

export function checkValues(xs: readonly number[]): void {
	xs.forEach((x, i) => {
		if (typeof x !== 'number' || !Number.isFinite(x)) throw new RangeError(`Value ${i + 1} of the chart is not a number (${String(x)}).`);
	});
}

/** Null for fewer than two values (no moving range yet). */
export function individualsChart(xs: readonly number[]): IndividualsChart | null {
	checkValues(xs);
	if (xs.length < 2) return null;
	const mr: (number | null)[] = [null];
	let sumMr = 0;
	for (let i = 1; i < xs.length; i++) {
		const r = Math.abs(xs[i] - xs[i - 1]);
		mr.push(r);
		sumMr += r;
	}
	const centre = xs.reduce((a, x) => a + x, 0) / xs.length;
	const mrBar = sumMr / (xs.length - 1);
	const sigma = mrBar / D2;
	return finiteResult('The individuals chart', { centre, mrBar, sigma, ucl: centre + 3 * sigma, lcl: centre - 3 * sigma, mrUcl: D4 * mrBar, mr });
}
