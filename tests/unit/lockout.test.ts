import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import {
	ACCOUNT_POLICY,
	ADDRESS_POLICY,
	addressAfterSuccess,
	afterFailure,
	describeLockKey,
	lockKey,
	lockDuration,
	lockMessage,
	lockVerdict,
	type ThrottleState
} from '../../src/lib/domain/auth/lockout';

const MIN = 60_000;

function fail(times: number, start: number, gap: number, policy = ACCOUNT_POLICY) {
	let s: ThrottleState | null = null;
	for (let i = 0; i < times; i++) s = afterFailure(s, start + i * gap, policy);
	return s!;
}

describe('lock-out after repeated failures', () => {
	test('the fifth failure within 15 minutes locks the account for 15 minutes', () => {
		const t0 = Date.UTC(2026, 11, 1, 8);
		const four = fail(4, t0, MIN);
		expect(lockVerdict(four, t0 + 4 * MIN)).toEqual({ locked: false });
		const five = afterFailure(four, t0 + 4 * MIN, ACCOUNT_POLICY);
		expect(lockVerdict(five, t0 + 4 * MIN)).toEqual({ locked: true, retryAfterMs: 15 * MIN });
		expect(lockVerdict(five, t0 + 19 * MIN)).toEqual({ locked: false });
	});

	test('failures spread wider than the window never lock', () => {
		const s = fail(50, 0, 16 * MIN);
		expect(s.locks).toBe(0);
		expect(s.failures).toBe(1);
	});

	test('each further lock doubles, capped at a day', () => {
		expect([1, 2, 3, 4, 5, 6, 7, 8].map((n) => lockDuration(ACCOUNT_POLICY, n) / MIN)).toEqual([15, 30, 60, 120, 240, 480, 960, 1440]);
		let s: ThrottleState | null = null;
		let now = 0;
		for (let lock = 1; lock <= 3; lock++) {
			for (let i = 0; i < 5; i++) s = afterFailure(s, now, ACCOUNT_POLICY);
			expect(s!.lockedUntil - now).toBe(lockDuration(ACCOUNT_POLICY, lock));
			now = s!.lockedUntil;
		}
	});

	test('an address gets 20 tries before it is locked', () => {
		expect(lockVerdict(fail(19, 0, 1000, ADDRESS_POLICY), 19_000).locked).toBe(false);
		expect(lockVerdict(fail(20, 0, 1000, ADDRESS_POLICY), 19_000).locked).toBe(true);
	});

	test('a guesser who tries whenever the key is open: bursts bounded, and past 100 in a row every failure locks a day', () => {
		fc.assert(
			fc.property(fc.array(fc.integer({ min: 0, max: 20 * MIN }), { minLength: 1, maxLength: 400 }), (gaps) => {
				let s: ThrottleState | null = null;
				let now = 0;
				const tried: number[] = [];
				for (const g of gaps) {
					now += g;
					if (lockVerdict(s, now).locked) continue;
					s = afterFailure(s, now, ACCOUNT_POLICY);
					tried.push(now);
					// fixed windows: at most 2 × (threshold − 1) + 1 tries in any 15 minutes
					const recent = tried.filter((t) => now - t < ACCOUNT_POLICY.windowMs).length;
					expect(recent).toBeLessThanOrEqual(2 * ACCOUNT_POLICY.maxFailures - 1);
					// NIST SP 800-63B §5.2.2: consecutive failures limited to no more than 100
					// from the 100th failure in a row on, every failure locks for the longest time
					expect(tried.length < ACCOUNT_POLICY.maxConsecutive || s.lockedUntil - now === ACCOUNT_POLICY.maxLockMs).toBe(true);
				}
			}),
			{ numRuns: 200 }
		);
		// slow and steady: one try every 16 minutes never trips the window, but the 100th locks for a day
		const slow = fail(100, 0, 16 * MIN);
		expect(slow.lockedUntil - 99 * 16 * MIN).toBe(24 * 60 * MIN);
		expect(fail(99, 0, 16 * MIN).lockedUntil).toBe(0);
	});

	test('the message says how long to wait', () => {
		expect(lockMessage(15 * MIN)).toBe('Too many failed sign-ins. Wait 15 minutes and try again, or ask the owner.');
		expect(lockMessage(10_000)).toMatch(/Wait 1 minute /);
		expect(lockMessage(240 * MIN)).toMatch(/Wait 4 hours /);
	});
});

describe('keys and a good sign-in', () => {
	test('a good sign-in ends the address’s run of failures and nothing else', () => {
		const s = { failures: 7, windowStart: 100, lockedUntil: 5000, locks: 2, consecutive: 57 };
		expect(addressAfterSuccess(s)).toEqual({ ...s, consecutive: 0 });
	});

	test('keys are lower-cased e-mails and addresses, and read back as words', () => {
		expect(lockKey('account', '  Rui@Shop.Example ')).toBe('account:rui@shop.example');
		expect(lockKey('address', '::ffff:192.0.2.1')).toBe('address:::ffff:192.0.2.1');
		expect(describeLockKey('account:rui@shop.example')).toEqual({ kind: 'account', subject: 'rui@shop.example', label: 'Sign-ins as rui@shop.example' });
		expect(describeLockKey('address:::ffff:192.0.2.1')).toEqual({ kind: 'address', subject: '::ffff:192.0.2.1', label: 'Sign-ins from address ::ffff:192.0.2.1' });
		expect(describeLockKey('session:abc')).toBeNull();
		expect(describeLockKey('account:')).toBeNull();
	});
});
