/**
 * Sign-in locks kept in the database: a good sign-in ends an address's run of failures, the
 * owner lifts a lock, and every lift is kept in an append-only log.
 */
import { describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { signInLockLift, signInThrottle } from '../../src/lib/server/db/schema';
import { LockLiftError, currentLocks, liftLock, recentLifts, recordSignInFailure, recordSignInSuccess, signInLocked } from '../../src/lib/server/sign-in-throttle';
import { testShop } from '../helpers/db';

const MIN = 60_000;

describe('the address after a good sign-in', () => {
	test('its failures in a row end, but the window count and a lock stand', () => {
		const shop = testShop();
		const t0 = Date.UTC(2026, 11, 3, 8);
		// 19 failures in one window from the shop's router, on several accounts
		for (let i = 0; i < 19; i++) recordSignInFailure(shop.db, { email: `typo${i % 3}@shop.test`, address: '192.0.2.50' }, t0 + i * 1000);
		const before = shop.db.select().from(signInThrottle).where(eq(signInThrottle.key, 'address:192.0.2.50')).get()!;
		expect([before.failures, before.consecutive]).toEqual([19, 19]);
		recordSignInSuccess(shop.db, { email: 'owner@shop.test', address: '192.0.2.50' });
		const after = shop.db.select().from(signInThrottle).where(eq(signInThrottle.key, 'address:192.0.2.50')).get()!;
		expect([after.failures, after.consecutive, after.lockedUntil]).toEqual([19, 0, 0]);
		// one more failure in the same window still locks the address: one good account reopens nothing
		recordSignInFailure(shop.db, { email: 'guess@shop.test', address: '192.0.2.50' }, t0 + 20_000);
		expect(signInLocked(shop.db, { email: 'owner@shop.test', address: '192.0.2.50' }, t0 + 21_000)).toBe(15 * MIN - 1000);
	});

	test('a busy shop behind one address never drifts into the long lock over months of typos', () => {
		const shop = testShop();
		let t = Date.UTC(2026, 0, 5, 8);
		// 300 working days; each: three typos, then the person gets it right
		for (let day = 0; day < 300; day++, t += 24 * 60 * MIN) {
			for (let i = 0; i < 3; i++) recordSignInFailure(shop.db, { email: 'tech@shop.test', address: '192.0.2.60' }, t + i * 1000);
			expect(signInLocked(shop.db, { email: 'tech@shop.test', address: '192.0.2.60' }, t + 5000), `day ${day}`).toBeNull();
			recordSignInSuccess(shop.db, { email: 'tech@shop.test', address: '192.0.2.60' });
		}
		const row = shop.db.select().from(signInThrottle).where(eq(signInThrottle.key, 'address:192.0.2.60')).get()!;
		expect(row.consecutive).toBe(0);
		expect(row.locks).toBe(0);
	});
});

describe('the owner lifts a lock', () => {
	test('a locked account is listed, lifted, signs in again, and the lift is recorded with who and until when', () => {
		const shop = testShop();
		const now = Date.UTC(2026, 11, 3, 9);
		for (let i = 0; i < 5; i++) recordSignInFailure(shop.db, { email: 'Tech@Shop.test', address: '198.51.100.4' }, now + i);
		const locks = currentLocks(shop.db, now + 10);
		expect(locks.map((l) => [l.key, l.kind, l.subject, l.label])).toEqual([['account:tech@shop.test', 'account', 'tech@shop.test', 'Sign-ins as tech@shop.test']]);
		const until = locks[0].lockedUntil;
		expect(until).toBe(now + 4 + 15 * MIN);

		const lifted = liftLock(shop.db, 'account:tech@shop.test', shop.actors.owner.id, now + 20);
		expect(lifted.key).toBe('account:tech@shop.test');
		expect(signInLocked(shop.db, { email: 'tech@shop.test', address: '198.51.100.4' }, now + 30)).toBeNull();
		expect(currentLocks(shop.db, now + 30)).toEqual([]);
		const log = recentLifts(shop.db);
		expect(log.map((l) => [l.key, l.lockedUntil, l.by, l.label])).toEqual([['account:tech@shop.test', until, 'Test owner', 'Sign-ins as tech@shop.test']]);
		// the count starts again from nothing: four more failures do not lock it
		for (let i = 0; i < 4; i++) recordSignInFailure(shop.db, { email: 'tech@shop.test', address: '198.51.100.5' }, now + 100 + i);
		expect(signInLocked(shop.db, { email: 'tech@shop.test', address: '198.51.100.5' }, now + 200)).toBeNull();
	});

	test('lifting a key that is not locked, has expired or never existed is refused and writes nothing', () => {
		const shop = testShop();
		const now = Date.UTC(2026, 11, 3, 10);
		for (let i = 0; i < 5; i++) recordSignInFailure(shop.db, { email: 'x@shop.test', address: '198.51.100.6' }, now + i);
		for (const [key, at] of [
			['account:x@shop.test', now + 16 * MIN], // expired on its own
			['address:198.51.100.6', now + 10], // counted, not locked
			['account:nobody@shop.test', now],
			["address:' or 1=1 --", now]
		] as const) {
			expect(() => liftLock(shop.db, key, shop.actors.owner.id, at), key).toThrow(LockLiftError);
		}
		expect(shop.db.select().from(signInLockLift).all()).toEqual([]);
		expect(shop.db.select().from(signInThrottle).all().length).toBe(2);
	});

	test('the log of lifts is append-only in the database', () => {
		const shop = testShop();
		const now = Date.now();
		for (let i = 0; i < 5; i++) recordSignInFailure(shop.db, { email: 'y@shop.test', address: '198.51.100.7' }, now + i);
		liftLock(shop.db, 'account:y@shop.test', shop.actors.owner.id, now + 10);
		const c = shop.db.$client;
		const row = c.prepare('select * from sign_in_lock_lift').get() as Record<string, unknown>;
		for (const sql of [
			`update sign_in_lock_lift set lifted_by = '${shop.actors.tech.id}'`,
			`delete from sign_in_lock_lift`,
			`insert or replace into sign_in_lock_lift (id, key, locked_until, lifted_by, at) values (${row.id}, 'account:z', 0, '${row.lifted_by}', 0)`
		]) {
			expect(() => c.exec(sql), sql).toThrow(/append-only/);
		}
		expect(c.prepare('select * from sign_in_lock_lift').all()).toEqual([row]);
	});
});
