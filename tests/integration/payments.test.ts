import Stripe from 'stripe';
import { eq } from 'drizzle-orm';
import { createServer, type Server } from 'node:http';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { paymentEvent, quote } from '../../src/lib/server/db/schema';
import { startPaymentFake, type PaymentFake } from '../../src/lib/server/payment-fake';
import { handlePaymentWebhook, paymentClient, paymentConfig, startCheckout, PaymentError, type WebhookOutcome } from '../../src/lib/server/payments';
import { addQuoteLine, decideQuote, sendQuote } from '../../src/lib/server/quotes';
import { customerShop, newOrder, walk } from '../helpers/customer';

const shop = customerShop();
const config = paymentConfig({});
let fake: PaymentFake;
let stripe: Stripe;
let bridge: Server;
const delivered: WebhookOutcome[] = [];

beforeAll(async () => {
	// stands in for the app's webhook route: raw body and signature header, as received
	bridge = createServer((req, res) => {
		const chunks: Buffer[] = [];
		req.on('data', (c) => chunks.push(c));
		req.on('end', () => {
			const out = handlePaymentWebhook(shop.db, stripe, config.webhookSecret, Buffer.concat(chunks).toString('utf8'), String(req.headers['stripe-signature'] ?? ''));
			delivered.push(out);
			res.writeHead(out.status, { 'content-type': 'application/json' });
			res.end(JSON.stringify(out));
		});
	});
	await new Promise<void>((r) => bridge.listen(0, '127.0.0.1', () => r()));
	const port = (bridge.address() as { port: number }).port;
	fake = await startPaymentFake({ secretKey: config.secretKey, webhookSecret: config.webhookSecret, webhookUrl: `http://127.0.0.1:${port}/api/payments/webhook` });
	stripe = paymentClient(config, fake.port);
});
afterAll(async () => {
	await fake.close();
	await new Promise((r) => bridge.close(r));
});

function approvedOrder() {
	const { order, serial } = newOrder(shop);
	walk(shop, serial, ['inspect', 'accept']);
	addQuoteLine(shop.db, order.id, { kind: 'part', description: 'Bearing kit', quantity: '1', unitPrice: '100.00' });
	sendQuote(shop.db, order.id);
	decideQuote(shop.db, order.id, { decision: 'approve' });
	return order;
}

const quoteOf = (orderId: number) => shop.db.select().from(quote).where(eq(quote.orderId, orderId)).get()!;

test('the SDK creates a checkout on the local fake; paying there sends a signed webhook that marks the quote paid', async () => {
	const order = approvedOrder();
	const url = await startCheckout(shop.db, stripe, order.id, 'http://localhost/track/x');
	expect(url).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${fake.port}/pay/cs_test_`));
	const q = quoteOf(order.id);
	expect(q.checkoutSessionId).toMatch(/^cs_test_/);
	// 100.00 + 8.25 % = 108.25
	expect(fake.sessions.get(q.checkoutSessionId!)!.amount_total).toBe(10825);
	const page = await fetch(url);
	expect(await page.text()).toContain('108.25 USD');
	const paid = await fetch(url, { method: 'POST', redirect: 'manual' });
	expect(paid.status).toBe(303);
	expect(paid.headers.get('location')).toBe('http://localhost/track/x?paid=1');
	expect(delivered.at(-1)).toEqual({ status: 200, result: 'paid' });
	expect(quoteOf(order.id)).toMatchObject({ paidCents: 10825 });
	expect(quoteOf(order.id).paidAt).not.toBeNull();
	await expect(startCheckout(shop.db, stripe, order.id, 'http://localhost/track/x')).rejects.toThrow(PaymentError);
});

test('a wrong API key is refused by the fake as the provider would', async () => {
	const wrong = new Stripe('sk_test_wrong_key', { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
	await expect(wrong.checkout.sessions.create({ mode: 'payment', success_url: 'http://localhost/' })).rejects.toMatchObject({ type: 'StripeAuthenticationError' });
});

function completedEvent(sessionId: string, quoteId: number, amount: number, id = `evt_test_${Math.random().toString(16).slice(2)}`) {
	return JSON.stringify({
		id,
		object: 'event',
		type: 'checkout.session.completed',
		created: Math.floor(Date.now() / 1000),
		data: { object: { id: sessionId, object: 'checkout.session', payment_status: 'paid', amount_total: amount, metadata: { quoteId: String(quoteId) } } }
	});
}

test('a forged webhook is rejected and changes nothing', async () => {
	const order = approvedOrder();
	await startCheckout(shop.db, stripe, order.id, 'http://localhost/track/y');
	const q = quoteOf(order.id);
	const payload = completedEvent(q.checkoutSessionId!, q.id, q.totalCents);
	const eventsBefore = shop.db.select().from(paymentEvent).all().length;
	// signed with a secret that is not ours
	const forged = stripe.webhooks.generateTestHeaderString({ payload, secret: 'whsec_someone_else' });
	expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, payload, forged)).toMatchObject({ status: 400 });
	// no signature at all
	expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, payload, null)).toMatchObject({ status: 400 });
	// a genuine signature over a different body (amount changed after signing)
	const good = stripe.webhooks.generateTestHeaderString({ payload, secret: config.webhookSecret });
	expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, payload.replace(String(q.totalCents), '1'), good)).toMatchObject({ status: 400 });
	expect(quoteOf(order.id).paidAt).toBeNull();
	expect(shop.db.select().from(paymentEvent).all()).toHaveLength(eventsBefore);
});

test('a replayed webhook changes nothing', async () => {
	const order = approvedOrder();
	await startCheckout(shop.db, stripe, order.id, 'http://localhost/track/z');
	const q = quoteOf(order.id);
	const payload = completedEvent(q.checkoutSessionId!, q.id, q.totalCents, 'evt_test_replay_1');
	const header = stripe.webhooks.generateTestHeaderString({ payload, secret: config.webhookSecret });
	const t0 = new Date('2026-12-01T12:00:00Z');
	expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, payload, header, t0)).toEqual({ status: 200, result: 'paid' });
	const after = quoteOf(order.id);
	expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, payload, header, new Date('2026-12-01T12:05:00Z'))).toEqual({ status: 200, result: 'replayed' });
	expect(quoteOf(order.id)).toEqual(after);
	expect(after.paidAt).toEqual(t0);
	// the same payment under a new event id is still only one payment
	const again = completedEvent(q.checkoutSessionId!, q.id, q.totalCents, 'evt_test_replay_2');
	const h2 = stripe.webhooks.generateTestHeaderString({ payload: again, secret: config.webhookSecret });
	expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, again, h2)).toEqual({ status: 200, result: 'ignored' });
	expect(quoteOf(order.id)).toEqual(after);
});

test('a completed checkout for the wrong amount or session does not mark the quote paid', async () => {
	const order = approvedOrder();
	await startCheckout(shop.db, stripe, order.id, 'http://localhost/track/w');
	const q = quoteOf(order.id);
	for (const payload of [completedEvent(q.checkoutSessionId!, q.id, q.totalCents - 1), completedEvent('cs_test_other', q.id, q.totalCents)]) {
		const header = stripe.webhooks.generateTestHeaderString({ payload, secret: config.webhookSecret });
		expect(handlePaymentWebhook(shop.db, stripe, config.webhookSecret, payload, header)).toEqual({ status: 200, result: 'ignored' });
	}
	expect(quoteOf(order.id).paidAt).toBeNull();
});

test('no checkout before the quote is approved', async () => {
	const { order } = newOrder(shop);
	await expect(startCheckout(shop.db, stripe, order.id, 'http://localhost/')).rejects.toThrow('Approve the quote');
});
