/**
 * When to try an undelivered e-mail again: capped exponential back-off without jitter
 * (base × 2^(attempt−1), at most `capMs`), giving up after `maxAttempts`.
 */
import { nonNegative, nonNegativeInt, positiveInt } from '../numbers';

export interface BackoffPolicy {
	baseMs: number;
	capMs: number;
	maxAttempts: number;
}

export const MAIL_BACKOFF: BackoffPolicy = { baseMs: 30_000, capMs: 3_600_000, maxAttempts: 8 };

/** Delay before the next try after `attempts` failed tries (1 = the first failure); null = give up. */
export function retryDelayMs(attempts: number, policy: BackoffPolicy = MAIL_BACKOFF): number | null {
	nonNegativeInt('Failed tries', attempts);
	if (typeof policy !== 'object' || policy === null) throw new RangeError('The back-off needs its policy.');
	nonNegative('The first delay', policy.baseMs);
	nonNegative('The longest delay', policy.capMs);
	positiveInt('The number of tries', policy.maxAttempts);
	if (attempts >= policy.maxAttempts) return null;
	// 2^(n−1) overflows to Infinity for very many tries: the cap applies (and a first delay of 0 stays 0).
	const doubled = policy.baseMs === 0 ? 0 : policy.baseMs * 2 ** Math.max(0, attempts - 1);
	return Math.min(policy.capMs, doubled);
}
