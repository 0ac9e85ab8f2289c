import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { simpleParser } from 'mailparser';
import nodemailer from 'nodemailer';
import { devMail, outboxMessage, trackLink } from '../../src/lib/server/db/schema';
import { startSmtpFake, type SmtpFake } from '../../src/lib/server/mail';
import { OutboxSender } from '../../src/lib/server/outbox';
import { hashToken, resolveTrackToken } from '../../src/lib/server/track-links';
import { resendTrackLink, revokeOrderLinks } from '../../src/lib/server/rebuild-orders';
import { customerShop, newOrder } from '../helpers/customer';
import type { TestShop } from '../helpers/db';

// The route uses the application's connection, opened from DATABASE_URL.
const dir = mkdtempSync(join(tmpdir(), 'spoolyard-track-'));
const dbFile = join(dir, 'track.db');
process.env.DATABASE_URL = dbFile;
process.env.TRACK_RATE_LIMIT = '6';

let shop: TestShop;
let load: (typeof import('../../src/routes/track/[token]/+page.server'))['load'];
let fake: SmtpFake;

beforeAll(async () => {
	shop = customerShop(dbFile);
	load = (await import('../../src/routes/track/[token]/+page.server')).load;
	fake = await startSmtpFake(shop.db, 0);
});
afterAll(async () => {
	await fake?.close();
	rmSync(dir, { recursive: true, force: true });
});

/** Deliver everything in the outbox through the SMTP fake, then read what reached `to`, oldest first. */
async function deliverAndRead(to: string) {
	const transport = nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, secure: false, ignoreTLS: true });
	const sender = new OutboxSender(shop.db, transport, { from: 'Test Turbo Shop <shop@test.example>' });
	await sender.drain();
	await sender.stop();
	const rows = shop.db.select().from(devMail).where(eq(devMail.rcptTo, to)).orderBy(devMail.id).all();
	return Promise.all(rows.map((r) => simpleParser(r.raw)));
}

/** The status-link tokens written in a message's text. */
const linkTokens = (text: string | undefined) => [...(text ?? '').matchAll(/\/track\/([A-Za-z0-9_-]{43})\b/g)].map((m) => m[1]);

let addr = 0;
/** Open the status page the way the framework does; returns the page data or the error it threw. */
async function open(token: string, address = `10.0.0.${++addr}`) {
	try {
		const data = await load({
			params: { token },
			getClientAddress: () => address,
			setHeaders: () => {},
			url: new URL(`http://localhost/track/${token}`)
			// eslint-disable-next-line @typescript-eslint/no-explicit-any
		} as any);
		return { ok: true as const, data };
	} catch (e) {
		const err = e as { status?: number; body?: unknown };
		return { ok: false as const, status: err.status, body: err.body };
	}
}

test('a live link opens the page; tampered, expired and revoked links all get the same answer', async () => {
	const a = newOrder(shop);
	const live = await open(a.token);
	expect(live.ok).toBe(true);

	// tampered: one character changed
	const tampered = a.token.slice(0, -1) + (a.token.endsWith('A') ? 'B' : 'A');
	// expired: a link whose expiry has passed
	const b = newOrder(shop);
	shop.db.update(trackLink).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(trackLink.tokenHash, hashToken(b.token))).run();
	// revoked by the office
	const c = newOrder(shop);
	expect(revokeOrderLinks(shop.db, c.order.id)).toBe(1);

	const answers = [await open(tampered), await open(b.token), await open(c.token), await open('not-even-a-token'), await open('A'.repeat(43))];
	for (const r of answers) expect(r).toEqual({ ok: false, status: 404, body: { message: 'This link is not valid. Ask the shop to send you a new one.' } });
});

test('re-sending a link revokes the old one and e-mails a new one that opens the page', async () => {
	const a = newOrder(shop);
	const email = a.order.email;
	// the first e-mail (sent at intake) carries the first link
	const first = await deliverAndRead(email);
	expect(first.map((m) => linkTokens(m.text))).toEqual([[a.token]]);
	expect((await open(a.token)).ok).toBe(true);

	const fresh = resendTrackLink(shop.db, a.order.id);
	expect(fresh).toMatch(/^[A-Za-z0-9_-]{43}$/);
	expect(fresh).not.toBe(a.token);
	expect(resolveTrackToken(shop.db, a.token)).toBeNull();
	expect(resolveTrackToken(shop.db, fresh)).toBe(a.order.id);

	// the new link arrives by e-mail, through real SMTP, to the order's address
	const outboxRow = shop.db.select().from(outboxMessage).where(eq(outboxMessage.orderId, a.order.id)).orderBy(outboxMessage.id).all().at(-1)!;
	const mails = await deliverAndRead(email);
	expect(mails).toHaveLength(2);
	const resent = mails[1];
	expect(resent.subject).toBe(`Test Turbo Shop: we received your unit (${a.order.code})`);
	expect(resent.to).toMatchObject({ text: email });
	expect(linkTokens(resent.text)).toEqual([fresh]);
	expect(resent.html).toContain(`/track/${fresh}`);
	expect(resent.messageId).toBe(`<outbox-${outboxRow.id}.${outboxRow.createdAt.getTime()}@spoolyard.invalid>`);

	// the old link now gets the same answer as any wrong link; the e-mailed one opens the order
	expect(await open(a.token)).toEqual({ ok: false, status: 404, body: { message: 'This link is not valid. Ask the shop to send you a new one.' } });
	expect(await open(linkTokens(resent.text)[0])).toMatchObject({ ok: true, data: { view: { orderCode: a.order.code } } });

	// only the hash is stored
	const stored = shop.db.select().from(trackLink).where(eq(trackLink.orderId, a.order.id)).all();
	expect(stored).toHaveLength(2);
	expect(stored.map((l) => l.tokenHash)).toEqual([hashToken(a.token), hashToken(fresh)]);
	expect(stored.every((l) => /^[0-9a-f]{64}$/.test(l.tokenHash))).toBe(true);
	// a link lasts 90 days by default
	const days = (stored[1].expiresAt.getTime() - stored[1].createdAt.getTime()) / 86_400_000;
	expect(days).toBe(90);
});

test('a re-sent link is e-mailed even to a customer who turned the intake notice off', async () => {
	const b = newOrder(shop, { notifyReceived: false });
	const email = b.order.email;
	expect(shop.db.select().from(outboxMessage).where(eq(outboxMessage.orderId, b.order.id)).all()).toHaveLength(0);
	const fresh = resendTrackLink(shop.db, b.order.id);
	const mails = await deliverAndRead(email);
	expect(mails.map((m) => linkTokens(m.text))).toEqual([[fresh]]);
	expect(resolveTrackToken(shop.db, b.token)).toBeNull();
});

test('the rate limit holds per address, for good and bad tokens alike', async () => {
	const a = newOrder(shop);
	const results = [];
	for (let i = 0; i < 8; i++) results.push(await open(i % 2 ? a.token : 'B'.repeat(43), '192.0.2.7'));
	expect(results.slice(0, 6).map((r) => (r.ok ? 200 : r.status))).toEqual([404, 200, 404, 200, 404, 200]);
	expect(results.slice(6).map((r) => (r.ok ? 200 : r.status))).toEqual([429, 429]);
	// another address is not affected
	expect((await open(a.token, '192.0.2.8')).ok).toBe(true);
});
