/**
 * A proportion with its Wilson score interval (Wilson 1927; Newcombe 1998, method 3).
 * Better than the simple p ± z·√(p(1−p)/n) for small lots and rates near 0 or 1: it never
 * leaves [0, 1] and does not collapse to zero width at 0/n.
 */
import { atMost, nonNegativeInt } from '../numbers';
import { zFor } from './normal';

export interface Interval {
	low: number;
	high: number;
}

export function wilsonInterval(successes: number, n: number, confidence = 0.95): Interval | null {
	nonNegativeInt('The count', successes);
	nonNegativeInt('The number of trials', n);
	atMost('The count', successes, 'The number of trials', n);
	const z = zFor(confidence);
	if (n === 0) return null;
	const p = successes / n;
	const z2 = z * z;
	const centre = p + z2 / (2 * n);
	const spread = z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
	const denom = 1 + z2 / n;
	return {
		low: successes === 0 ? 0 : Math.max(0, (centre - spread) / denom),
		high: successes === n ? 1 : Math.min(1, (centre + spread) / denom)
	};
}

/** Rate with its interval, or nulls when nothing was counted. */
export function rateWithInterval(successes: number, n: number, confidence = 0.95): { rate: number | null; low: number | null; high: number | null } {
	const ci = wilsonInterval(successes, n, confidence);
	return { rate: n ? successes / n : null, low: ci?.low ?? null, high: ci?.high ?? null };
}
