/**
 * Failed sign-ins, kept in the database per account and per client address, judged by the
 * policy in domain/auth/lockout.ts.
 */
import { eq, inArray } from 'drizzle-orm';
import { ACCOUNT_POLICY, ADDRESS_POLICY, afterFailure, lockVerdict, type LockoutPolicy, type ThrottleState } from '../domain/auth/lockout';
import type { Db } from './db';
import { signInThrottle } from './db/schema';

export interface ThrottleKeys {
	email: string;
	address: string;
}

function keysOf(k: ThrottleKeys): { key: string; policy: LockoutPolicy }[] {
	return [
		{ key: `account:${k.email.trim().toLowerCase().slice(0, 200)}`, policy: ACCOUNT_POLICY },
		{ key: `address:${k.address.slice(0, 100)}`, policy: ADDRESS_POLICY }
	];
}

/** The longest wait among the keys, or null when sign-in may be tried. */
export function signInLocked(db: Db, k: ThrottleKeys, now = Date.now()): number | null {
	const keys = keysOf(k).map((x) => x.key);
	const rows = db.select().from(signInThrottle).where(inArray(signInThrottle.key, keys)).all();
	let wait = 0;
	for (const r of rows) {
		const v = lockVerdict(r, now);
		if (v.locked) wait = Math.max(wait, v.retryAfterMs);
	}
	return wait > 0 ? wait : null;
}

/** Count one failure against the account and the address. */
export function recordSignInFailure(db: Db, k: ThrottleKeys, now = Date.now()): void {
	db.transaction(
		(tx) => {
			for (const { key, policy } of keysOf(k)) {
				const row = tx.select().from(signInThrottle).where(eq(signInThrottle.key, key)).get();
				const next: ThrottleState = afterFailure(row ?? null, now, policy);
				tx.insert(signInThrottle)
					.values({ key, ...next })
					.onConflictDoUpdate({ target: signInThrottle.key, set: next })
					.run();
			}
		},
		{ behavior: 'immediate' }
	);
}

/** A good sign-in clears the account's count (not the address's: one good account must not unlock guessing). */
export function recordSignInSuccess(db: Db, k: ThrottleKeys): void {
	db.delete(signInThrottle).where(eq(signInThrottle.key, keysOf(k)[0].key)).run();
}

/** The owner lifts a lock on an account (e.g. after talking to the person). */
export function clearAccountLock(db: Db, email: string): void {
	db.delete(signInThrottle).where(eq(signInThrottle.key, keysOf({ email, address: '' })[0].key)).run();
}
