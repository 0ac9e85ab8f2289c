/**
 * Failed sign-ins, kept in the database per account and per client address, judged by the
 * policy in domain/auth/lockout.ts; the owner can lift a lock, and every lift is kept.
 */
import { desc, eq, gt, inArray } from 'drizzle-orm';
import {
	ACCOUNT_POLICY,
	ADDRESS_POLICY,
	addressAfterSuccess,
	afterFailure,
	describeLockKey,
	lockKey,
	lockVerdict,
	type LockKind,
	type LockoutPolicy,
	type ThrottleState
} from '../domain/auth/lockout';
import type { Db, DbOrTx } from './db';
import { signInLockLift, signInThrottle, user } from './db/schema';

export interface ThrottleKeys {
	email: string;
	address: string;
}

function keysOf(k: ThrottleKeys): { key: string; policy: LockoutPolicy }[] {
	return [
		{ key: lockKey('account', k.email), policy: ACCOUNT_POLICY },
		{ key: lockKey('address', k.address), policy: ADDRESS_POLICY }
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

/** A good sign-in clears the account's count and ends the address's run of failures in a row. */
export function recordSignInSuccess(db: Db, k: ThrottleKeys): void {
	const [account, address] = keysOf(k);
	db.transaction(
		(tx) => {
			tx.delete(signInThrottle).where(eq(signInThrottle.key, account.key)).run();
			const row = tx.select().from(signInThrottle).where(eq(signInThrottle.key, address.key)).get();
			if (row && row.consecutive > 0) {
				const { key: _key, ...state } = row;
				tx.update(signInThrottle).set(addressAfterSuccess(state)).where(eq(signInThrottle.key, address.key)).run();
			}
		},
		{ behavior: 'immediate' }
	);
}

export interface CurrentLock {
	key: string;
	kind: LockKind;
	subject: string;
	label: string;
	lockedUntil: number;
	/** How many times the key has been locked since its last success. */
	locks: number;
	consecutive: number;
}

/** Keys locked right now, the longest first. */
export function currentLocks(db: DbOrTx, now = Date.now()): CurrentLock[] {
	return db
		.select()
		.from(signInThrottle)
		.where(gt(signInThrottle.lockedUntil, now))
		.orderBy(desc(signInThrottle.lockedUntil))
		.all()
		.flatMap((r) => {
			const d = describeLockKey(r.key);
			return d ? [{ key: r.key, ...d, lockedUntil: r.lockedUntil, locks: r.locks, consecutive: r.consecutive }] : [];
		});
}

export class LockLiftError extends Error {}

/**
 * The owner lifts a lock (after talking to the person, say): the key's count starts again
 * from nothing and the lift is recorded. Refused when the key is not locked any more.
 */
export function liftLock(db: Db, key: string, ownerId: string, now = Date.now()): CurrentLock {
	return db.transaction(
		(tx) => {
			const lock = currentLocks(tx, now).find((l) => l.key === key);
			if (!lock) throw new LockLiftError('That lock has already ended or been lifted; nothing to do.');
			tx.delete(signInThrottle).where(eq(signInThrottle.key, key)).run();
			tx.insert(signInLockLift).values({ key, lockedUntil: lock.lockedUntil, liftedBy: ownerId, at: new Date(now) }).run();
			return lock;
		},
		{ behavior: 'immediate' }
	);
}

/** The latest lifts with who lifted them. */
export function recentLifts(db: DbOrTx, limit = 20) {
	return db
		.select({ id: signInLockLift.id, key: signInLockLift.key, lockedUntil: signInLockLift.lockedUntil, at: signInLockLift.at, by: user.name })
		.from(signInLockLift)
		.innerJoin(user, eq(user.id, signInLockLift.liftedBy))
		.orderBy(desc(signInLockLift.id))
		.limit(limit)
		.all()
		.map((r) => ({ ...r, at: r.at.toISOString(), label: describeLockKey(r.key)?.label ?? r.key }));
}
