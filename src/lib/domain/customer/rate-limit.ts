/**
 * A token bucket per key (e.g. the client's address): `capacity` requests at once, refilled
 * at `refillPerSecond`. Pure: the caller passes the time. Keys idle long enough to be full
 * again are dropped so the table does not grow without bound.
 */

import { finite, positive, positiveInt, result } from '../numbers';

export interface LimitVerdict {
	allowed: boolean;
	/** Milliseconds until the next request would be allowed (0 when allowed). */
	retryAfterMs: number;
	remaining: number;
}

export class TokenBucketLimiter {
	private buckets = new Map<string, { tokens: number; at: number }>();

	constructor(
		readonly capacity: number,
		readonly refillPerSecond: number,
		private readonly maxKeys = 10_000
	) {
		finite('The bucket capacity', capacity);
		if (capacity < 1) throw new RangeError(`The bucket capacity must be at least 1 (got ${capacity}).`);
		positive('The refill rate', refillPerSecond);
		positiveInt('The number of keys kept', maxKeys);
	}

	take(key: string, nowMs: number): LimitVerdict {
		finite('The time', nowMs);
		const b = this.buckets.get(key) ?? { tokens: this.capacity, at: nowMs };
		const elapsed = Math.max(0, nowMs - b.at) / 1000;
		const tokens = Math.min(this.capacity, b.tokens + elapsed * this.refillPerSecond);
		if (tokens >= 1) {
			this.buckets.set(key, { tokens: tokens - 1, at: nowMs });
			this.prune(nowMs);
			return { allowed: true, retryAfterMs: 0, remaining: Math.floor(tokens - 1) };
		}
		this.buckets.set(key, { tokens, at: nowMs });
		return { allowed: false, retryAfterMs: result('The wait', Math.ceil(((1 - tokens) / this.refillPerSecond) * 1000)), remaining: 0 };
	}

	get size(): number {
		return this.buckets.size;
	}

	private prune(nowMs: number) {
		if (this.buckets.size <= this.maxKeys) return;
		const fullAfter = (this.capacity / this.refillPerSecond) * 1000;
		for (const [k, b] of this.buckets) if (nowMs - b.at >= fullAfter) this.buckets.delete(k);
		// still too many: drop the oldest entries (insertion order)
		for (const k of this.buckets.keys()) {
			if (this.buckets.size <= this.maxKeys) break;
			this.buckets.delete(k);
		}
	}
}
