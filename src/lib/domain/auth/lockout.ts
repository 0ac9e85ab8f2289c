/**
 * Repeated failed sign-ins: count them per account and per client address inside a window,
 * lock the key for a while once the count reaches the threshold, and double the lock each
 * time it is reached again (capped), so a guesser gets a handful of tries per lock period.
 *
 * The three settings are the ones the OWASP Authentication Cheat Sheet names for account
 * lockout (threshold, observation window, lockout duration); the values are common practice.
 * NIST SP 800-63B §5.2.2 requires that consecutive failures on one account be limited to no
 * more than 100: past `maxConsecutive` failures without a success, every further failure locks
 * the key for the longest lock.
 */

import { instantMs, nonNegative, nonNegativeInt, positiveInt } from '../numbers';

export interface LockoutPolicy {
	/** Failures within the window that lock the key. */
	maxFailures: number;
	windowMs: number;
	/** The first lock; each further lock doubles it, up to maxLockMs. */
	lockMs: number;
	maxLockMs: number;
	/** Failures in a row (without a success, across windows) after which every failure locks for maxLockMs. */
	maxConsecutive: number;
}

const MINUTE = 60_000;

/** Per e-mail address tried (known or not, so that a lock says nothing about who has an account). */
export const ACCOUNT_POLICY: LockoutPolicy = { maxFailures: 5, windowMs: 15 * MINUTE, lockMs: 15 * MINUTE, maxLockMs: 24 * 60 * MINUTE, maxConsecutive: 100 };
/** Per client address: a shop shares one address behind its router, so the threshold is higher. */
export const ADDRESS_POLICY: LockoutPolicy = { maxFailures: 20, windowMs: 15 * MINUTE, lockMs: 15 * MINUTE, maxLockMs: 24 * 60 * MINUTE, maxConsecutive: 400 };

export interface ThrottleState {
	failures: number;
	/** When the current counting window began (ms since the epoch). */
	windowStart: number;
	/** 0 when not locked. */
	lockedUntil: number;
	/** How many times the key has been locked since its last success. */
	locks: number;
	/** Failures since the last success. */
	consecutive: number;
}

export type LockVerdict = { locked: false } | { locked: true; retryAfterMs: number };

function checkPolicy(p: LockoutPolicy): LockoutPolicy {
	if (typeof p !== 'object' || p === null) throw new RangeError('The lockout needs its policy.');
	positiveInt('The failures that lock', p.maxFailures);
	nonNegative('The counting window', p.windowMs);
	nonNegative('The first lock', p.lockMs);
	nonNegative('The longest lock', p.maxLockMs);
	positiveInt('The failures in a row that lock for the longest', p.maxConsecutive);
	return p;
}

function checkState(s: ThrottleState | null | undefined): void {
	if (s === null || s === undefined) return;
	if (typeof s !== 'object') throw new RangeError('The throttle state is not a record.');
	nonNegativeInt('The failures counted', s.failures);
	instantMs('The start of the window', s.windowStart);
	instantMs('The end of the lock', s.lockedUntil);
	nonNegativeInt('The locks so far', s.locks);
	nonNegativeInt('The failures in a row', s.consecutive);
}

export function lockVerdict(state: ThrottleState | null | undefined, now: number): LockVerdict {
	instantMs('The time', now);
	checkState(state);
	if (!state || state.lockedUntil <= now) return { locked: false };
	return { locked: true, retryAfterMs: state.lockedUntil - now };
}

export function lockDuration(policy: LockoutPolicy, lockNumber: number): number {
	checkPolicy(policy);
	nonNegativeInt('The lock number', lockNumber);
	// 2^(n−1) overflows to Infinity for very many locks: the cap applies (and a first lock of 0 stays 0).
	const doubled = policy.lockMs === 0 ? 0 : policy.lockMs * 2 ** Math.max(0, lockNumber - 1);
	return Math.min(policy.maxLockMs, doubled);
}

/** The state after one more failure at `now`. */
export function afterFailure(state: ThrottleState | null | undefined, now: number, policy: LockoutPolicy): ThrottleState {
	instantMs('The time', now);
	checkState(state);
	checkPolicy(policy);
	const locks = state?.locks ?? 0;
	const consecutive = (state?.consecutive ?? 0) + 1;
	const inWindow = state && now - state.windowStart < policy.windowMs && state.lockedUntil <= now;
	const failures = inWindow ? state.failures + 1 : 1;
	const windowStart = inWindow ? state.windowStart : now;
	if (consecutive >= policy.maxConsecutive) {
		return { failures: 0, windowStart: now, lockedUntil: now + policy.maxLockMs, locks: locks + 1, consecutive };
	}
	if (failures >= policy.maxFailures) {
		const n = locks + 1;
		return { failures: 0, windowStart: now, lockedUntil: now + lockDuration(policy, n), locks: n, consecutive };
	}
	return { failures, windowStart, lockedUntil: 0, locks, consecutive };
}

/** A sentence for the sign-in form. */
export function lockMessage(retryAfterMs: number): string {
	nonNegative('The wait', retryAfterMs);
	const minutes = Math.max(1, Math.ceil(retryAfterMs / MINUTE));
	const when = minutes >= 120 ? `${Math.ceil(minutes / 60)} hours` : minutes === 1 ? '1 minute' : `${minutes} minutes`;
	return `Too many failed sign-ins. Wait ${when} and try again, or ask the owner.`;
}

/**
 * The address's state after a good sign-in from it: the run of failures in a row ends (so a
 * busy shop behind one router never drifts to the long lock over months of typos), but the
 * failures in the current window and any lock stand, so one good account does not reopen
 * guessing at others from the same address. The account's own state is simply cleared.
 */
export function addressAfterSuccess(state: ThrottleState): ThrottleState {
	if (typeof state !== 'object' || state === null) throw new RangeError('The throttle state is missing.');
	checkState(state);
	return { ...state, consecutive: 0 };
}

export type LockKind = 'account' | 'address';

/** Throttle keys are `account:<e-mail, lower case>` and `address:<client address>`. */
export function lockKey(kind: LockKind, subject: string): string {
	return kind === 'account' ? `account:${subject.trim().toLowerCase().slice(0, 200)}` : `address:${subject.slice(0, 100)}`;
}

/** What a key is about, in words for the owner's screen; null for a key of no known kind. */
export function describeLockKey(key: string): { kind: LockKind; subject: string; label: string } | null {
	const m = /^(account|address):(.+)$/s.exec(key);
	if (!m) return null;
	const kind = m[1] as LockKind;
	return { kind, subject: m[2], label: kind === 'account' ? `Sign-ins as ${m[2]}` : `Sign-ins from address ${m[2]}` };
}
