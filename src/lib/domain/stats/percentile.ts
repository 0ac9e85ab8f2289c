/**
 * Sample quantiles by linear interpolation between order statistics: Hyndman & Fan (1996),
 * "Sample quantiles in statistical packages", The American Statistician 50(4), definition 7
 * (h = (n − 1)·q + 1). The median is q = 0.5.
 */
import { finite, fraction, list, positiveInt } from '../numbers';

/** 1-based ranks of the two order statistics definition 7 interpolates between, and the weight. */
export function quantileRanks(n: number, q: number): { lo: number; hi: number; weight: number } {
	positiveInt('The sample size', n);
	fraction('The quantile level', q);
	const h = (n - 1) * q + 1;
	const lo = Math.floor(h);
	return { lo, hi: Math.min(n, lo + 1), weight: h - lo };
}

/** Interpolate from the two order statistics (as found by `quantileRanks`). */
export function interpolate(loValue: number, hiValue: number, weight: number): number {
	finite('The lower order statistic', loValue);
	finite('The upper order statistic', hiValue);
	fraction('The interpolation weight', weight);
	const span = hiValue - loValue;
	// Values of opposite sign near the largest double: the difference overflows, the weighted sum does not.
	if (!Number.isFinite(span)) return loValue * (1 - weight) + hiValue * weight;
	return loValue + weight * span;
}

/** Quantile of an unsorted sample; null when empty. */
export function quantile(values: readonly number[], q: number): number | null {
	list<number>('The sample', values).forEach((v, i) => finite(`Value ${i + 1} of the sample`, v));
	fraction('The quantile level', q);
	if (values.length === 0) return null;
	const sorted = [...values].sort((a, b) => a - b);
	const { lo, hi, weight } = quantileRanks(sorted.length, q);
	return interpolate(sorted[lo - 1], sorted[hi - 1], weight);
}

export function median(values: readonly number[]): number | null {
	return quantile(values, 0.5);
}
