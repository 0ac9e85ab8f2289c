import { simpleParser } from 'mailparser';
import { eq } from 'drizzle-orm';
import nodemailer from 'nodemailer';
import { createServer } from 'node:net';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { devMail, outboxMessage } from '../../src/lib/server/db/schema';
import { startSmtpFake, type SmtpFake } from '../../src/lib/server/mail';
import { OutboxSender, enqueueMail } from '../../src/lib/server/outbox';
import { renderNotice } from '../../src/lib/domain/customer/mail-templates';
import { customerShop } from '../helpers/customer';

const shop = customerShop();
let fake: SmtpFake;
beforeAll(async () => {
	fake = await startSmtpFake(shop.db, 0);
});
afterAll(async () => fake.close());

const transport = () => nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, secure: false, ignoreTLS: true });
const FROM = 'Test Turbo Shop <shop@test.example>';

function queue(n: number, tag: string) {
	return shop.db.transaction((tx) =>
		Array.from({ length: n }, (_, i) =>
			enqueueMail(tx, {
				kind: 'test',
				to: `r${i}-${tag}@test.example`,
				mail: renderNotice('in_work', { shopName: 'Test Turbo Shop', customerName: `R${i}`, orderCode: `${tag}-${i}`, serial: 'SY-00001' })
			})
		)
	);
}

function received(tag: string) {
	return shop.db.select().from(devMail).all().filter((m) => m.rcptTo.endsWith(`-${tag}@test.example`));
}

test('mail written inside a transaction that rolls back never exists', () => {
	expect(() =>
		shop.db.transaction((tx) => {
			enqueueMail(tx, { kind: 'test', to: 'never@test.example', mail: { subject: 's', text: 't', html: '<p>t</p>' } });
			throw new Error('the change failed');
		})
	).toThrow('the change failed');
	expect(shop.db.select().from(outboxMessage).where(eq(outboxMessage.toAddress, 'never@test.example')).all()).toHaveLength(0);
});

test('a restart in the middle of the queue delivers every message exactly once', async () => {
	const ids = queue(10, 'restart');
	const first = new OutboxSender(shop.db, transport(), { from: FROM, owner: 'first' });
	expect(await first.drain(4)).toBe(4);
	await first.stop(); // the process goes down here
	const second = new OutboxSender(shop.db, transport(), { from: FROM, owner: 'second' });
	expect(await second.drain()).toBe(6);
	expect(await second.drain()).toBe(0); // nothing left, nothing sent again

	const got = received('restart');
	expect(got).toHaveLength(10);
	const parsed = await Promise.all(got.map((m) => simpleParser(m.raw)));
	const messageIds = parsed.map((p) => p.messageId);
	expect(new Set(messageIds).size).toBe(10);
	const fromIds = messageIds.map((m) => Number(/^<outbox-(\d+)\./.exec(m ?? '')?.[1])).sort((a, b) => a - b);
	expect(fromIds).toEqual([...ids].sort((a, b) => a - b));
	expect(parsed[0].text).toContain('Work on your unit');
	expect(parsed[0].html).toContain('<p>');
	expect(parsed[0].from?.text).toContain('Test Turbo Shop');
	const rows = shop.db.select().from(outboxMessage).all().filter((r) => ids.includes(r.id));
	expect(rows.every((r) => r.status === 'sent' && r.attempts === 1 && r.leaseOwner === null)).toBe(true);
});

test('a row claimed by a sender that died is left alone until its lease runs out, then sent once', async () => {
	const [id] = queue(1, 'lease');
	let now = new Date();
	const dead = new OutboxSender(shop.db, transport(), { from: FROM, owner: 'dead', leaseMs: 60_000, clock: () => now });
	expect(dead.claim()?.id).toBe(id); // claimed, then the process died before sending
	const next = new OutboxSender(shop.db, transport(), { from: FROM, owner: 'next', leaseMs: 60_000, clock: () => now });
	expect(await next.drain()).toBe(0);
	expect(received('lease')).toHaveLength(0);
	now = new Date(now.getTime() + 61_000);
	expect(await next.drain()).toBe(1);
	expect(received('lease')).toHaveLength(1);
	expect(shop.db.select().from(outboxMessage).where(eq(outboxMessage.id, id)).get()).toMatchObject({ status: 'sent', attempts: 2 });
});

test('a failing server: the error is recorded, retried with back-off, and given up after the last try', async () => {
	// a port with nothing listening
	const closed = await new Promise<number>((resolve) => {
		const s = createServer();
		s.listen(0, '127.0.0.1', () => {
			const p = (s.address() as { port: number }).port;
			s.close(() => resolve(p));
		});
	});
	const [id] = queue(1, 'fail');
	let now = new Date(Date.now() + 1000);
	const bad = nodemailer.createTransport({ host: '127.0.0.1', port: closed, secure: false, ignoreTLS: true, connectionTimeout: 2000 });
	const sender = new OutboxSender(shop.db, bad, { from: FROM, clock: () => now, backoff: { baseMs: 30_000, capMs: 3_600_000, maxAttempts: 3 } });
	expect(await sender.drain(1)).toBe(1);
	let row = shop.db.select().from(outboxMessage).where(eq(outboxMessage.id, id)).get()!;
	expect(row.status).toBe('pending');
	expect(row.lastError).toMatch(/ECONNREFUSED|connect/i);
	expect(row.nextAttemptAt.getTime() - now.getTime()).toBe(30_000);
	expect(await sender.drain()).toBe(0); // not due yet
	now = new Date(now.getTime() + 30_000);
	await sender.drain(1);
	row = shop.db.select().from(outboxMessage).where(eq(outboxMessage.id, id)).get()!;
	expect(row.nextAttemptAt.getTime() - now.getTime()).toBe(60_000);
	now = new Date(now.getTime() + 60_000);
	await sender.drain(1);
	row = shop.db.select().from(outboxMessage).where(eq(outboxMessage.id, id)).get()!;
	expect(row).toMatchObject({ status: 'failed', attempts: 3 });
	expect(received('fail')).toHaveLength(0);
});

test('the running loop picks up new mail and stops cleanly', async () => {
	const sender = new OutboxSender(shop.db, transport(), { from: FROM, pollMs: 50 });
	sender.start();
	queue(3, 'loop');
	await expect.poll(() => received('loop').length, { timeout: 5000 }).toBe(3);
	await sender.stop();
	queue(1, 'loop-after');
	await new Promise((r) => setTimeout(r, 200));
	expect(received('loop-after')).toHaveLength(0);
});
