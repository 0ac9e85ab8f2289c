/**
 * Sample quantiles by linear interpolation between order statistics: Hyndman & Fan (1996),
 * "Sample quantiles in statistical packages", The American Statistician 50(4), definition 7
 * (h = (n − 1)·q + 1). The median is q = 0.5.
 */

/** 1-based ranks of the two order statistics definition 7 interpolates between, and the weight. */
export function quantileRanks(n: number, q: number): { lo: number; hi: number; weight: number } {
	if (n <= 0) throw new RangeError('quantile of an empty sample');
	if (!(q >= 0 && q <= 1)) throw new RangeError(`quantile needs 0 ≤ q ≤ 1, got ${q}`);
	const h = (n - 1) * q + 1;
	const lo = Math.floor(h);
	return { lo, hi: Math.min(n, lo + 1), weight: h - lo };
}

/** Interpolate from the two order statistics (as found by `quantileRanks`). */
export function interpolate(loValue: number, hiValue: number, weight: number): number {
	return loValue + weight * (hiValue - loValue);
}

/** Quantile of an unsorted sample; null when empty. */
export function quantile(values: readonly number[], q: number): number | null {
	if (values.length === 0) return null;
	const sorted = [...values].sort((a, b) => a - b);
	const { lo, hi, weight } = quantileRanks(sorted.length, q);
	return interpolate(sorted[lo - 1], sorted[hi - 1], weight);
}

export function median(values: readonly number[]): number | null {
	return quantile(values, 0.5);
}
