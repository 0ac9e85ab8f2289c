import { expect, test } from 'vitest';
import { TokenBucketLimiter } from '../../src/lib/domain/customer/rate-limit';
import { MAIL_BACKOFF, retryDelayMs } from '../../src/lib/domain/customer/backoff';
import { renderNotice } from '../../src/lib/domain/customer/mail-templates';
import { customerStepIndex, noticeForMove } from '../../src/lib/domain/customer/progress';
import { decide } from '../../src/lib/domain/units/machine';

test('token bucket, worked example: 3 at once, then one per second', () => {
	// Token bucket as described in RFC 2697 §3 (single rate: committed burst size, tokens
	// added at a fixed rate up to the burst size): CBS = 3, rate = 1 token/s.
	const l = new TokenBucketLimiter(3, 1);
	expect([0, 0, 0].map((t) => l.take('a', t).allowed)).toEqual([true, true, true]);
	const refused = l.take('a', 0);
	expect(refused.allowed).toBe(false);
	expect(refused.retryAfterMs).toBe(1000);
	expect(l.take('a', 500).allowed).toBe(false); // half a token
	expect(l.take('a', 1000).allowed).toBe(true); // one token after 1 s
	expect(l.take('a', 1000).allowed).toBe(false);
	expect(l.take('b', 1000).allowed).toBe(true); // another address has its own bucket
	expect(l.take('a', 10_000).remaining).toBe(2); // refilled to 3, never more; one taken
});

test('the limiter forgets idle addresses beyond its key limit', () => {
	const l = new TokenBucketLimiter(2, 1, 10);
	for (let i = 0; i < 50; i++) l.take(`k${i}`, i * 10_000);
	expect(l.size).toBeLessThanOrEqual(10);
});

test('back-off doubles from 30 s, caps at an hour, gives up after 8 tries', () => {
	// Capped exponential back-off without jitter, as in "Exponential Backoff And Jitter"
	// (AWS Architecture Blog, 2015): sleep = min(cap, base × 2^attempt).
	expect([1, 2, 3, 4, 5, 6, 7].map((n) => retryDelayMs(n))).toEqual([30_000, 60_000, 120_000, 240_000, 480_000, 960_000, 1_920_000]);
	expect(retryDelayMs(7, { ...MAIL_BACKOFF, capMs: 600_000 })).toBe(600_000);
	expect(retryDelayMs(8)).toBeNull();
});

test('e-mail templates: shop name, escaped text, plain and HTML, no images', () => {
	const m = renderNotice('received', { shopName: 'Test <Shop>', customerName: 'A & B', orderCode: 'RO-26-0001', serial: 'SY-00001', link: 'http://localhost/track/x' });
	expect(m.subject).toBe('Test <Shop>: we received your unit (RO-26-0001)');
	expect(m.text).toContain('http://localhost/track/x');
	expect(m.text).toContain('— Test <Shop>');
	expect(m.html).toContain('Test &lt;Shop&gt;');
	expect(m.html).toContain('A &amp; B');
	expect(m.html).not.toMatch(/<img|<script|url\(/i);
	const s = renderNotice('shipped', { shopName: 'S', customerName: 'C', orderCode: 'O', serial: 'SY-00002', carrier: 'Fenwick Parcel', trackingNumber: 'FP-1' });
	expect(s.text).toContain('Tracking number: FP-1');
});

test('which moves e-mail the customer, and the plain-word steps', () => {
	expect(noticeForMove('clean', 'cleaned')).toBe('in_work');
	expect(noticeForMove('ship', 'shipped')).toBe('shipped');
	expect(noticeForMove('return', 'shipped')).toBe('shipped');
	expect(noticeForMove('paint', 'painted')).toBeNull();
	expect(customerStepIndex('received')).toBe(0);
	expect(customerStepIndex('accepted')).toBe(1);
	expect(customerStepIndex('scrapped')).toBe(-1);
});

const u = (state: 'inspected' | 'accepted' | 'cleaned') => ({ serial: 'SY-00009', state, held: false, holdReason: null });

test('a customer unit does not start work before its quote is approved', () => {
	const refused = decide(u('accepted'), { action: 'clean', role: 'tech', stationStage: 'clean' }, { quoteApproved: false });
	expect(refused).toMatchObject({ ok: false, kind: 'refused' });
	expect(!refused.ok && refused.message).toContain('quote must be approved');
	expect(decide(u('accepted'), { action: 'clean', role: 'tech', stationStage: 'clean' }, { quoteApproved: true }).ok).toBe(true);
	// shop stock (no quote needed)
	expect(decide(u('accepted'), { action: 'clean', role: 'tech', stationStage: 'clean' }, { quoteApproved: null }).ok).toBe(true);
});

test('return unrepaired: only a customer unit after a declined quote, only before work, not by a tech', () => {
	const declined = { customerUnit: true, quoteDeclined: true };
	for (const state of ['inspected', 'accepted'] as const) {
		const d = decide(u(state), { action: 'return', role: 'office', stationStage: null }, declined);
		expect(d).toMatchObject({ ok: true, to: 'shipped', data: { unrepaired: true } });
	}
	expect(decide(u('cleaned'), { action: 'return', role: 'lead', stationStage: null }, declined).ok).toBe(false);
	expect(decide(u('accepted'), { action: 'return', role: 'tech', stationStage: 'teardown' }, declined)).toMatchObject({ ok: false, kind: 'forbidden' });
	expect(decide(u('accepted'), { action: 'return', role: 'lead', stationStage: null }, { customerUnit: false })).toMatchObject({ ok: false, kind: 'refused' });
	expect(decide(u('accepted'), { action: 'return', role: 'lead', stationStage: null }, { customerUnit: true, quoteDeclined: false })).toMatchObject({ ok: false, kind: 'refused' });
	expect(decide(u('accepted'), { action: 'return', role: 'lead', stationStage: null }, {}).ok).toBe(false);
});
