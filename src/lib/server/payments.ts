/**
 * Paying an approved quote through the payment provider's Node SDK (`stripe`), in test mode.
 * In dev, demo and tests the SDK points at the local fake (`payment-fake.ts`) on 127.0.0.1.
 * A checkout session is created for the quote's total; the provider's signed webhook
 * `checkout.session.completed` marks the quote paid. The signature is checked with the
 * SDK; each event id is handled once (a replay changes nothing).
 */
import Stripe from 'stripe';
import { desc, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from './db';
import { paymentEvent, quote, rebuildOrder } from './db/schema';
import { getRebuildSettings } from './rebuild-settings';

export interface PaymentConfig {
	mode: 'fake' | 'provider';
	secretKey: string;
	webhookSecret: string;
	fakePort: number;
}

/** The fake's published keys: good for the local fake only, never for the provider. */
export const FAKE_SECRET_KEY = 'sk_test_fake_spoolyard_local_only';
export const FAKE_WEBHOOK_SECRET = 'whsec_fake_spoolyard_local_only';

export class PaymentConfigError extends Error {}

/**
 * Payment settings from the environment. In provider mode the secret key and the webhook
 * secret must be the shop's own: a missing, blank or published value stops the server with a
 * sentence naming the variable (a webhook checked against a public secret would let anyone
 * mark a quote paid). An unknown PAYMENT_MODE is refused the same way rather than read as fake.
 */
export function paymentConfig(env: Record<string, string | undefined> = process.env): PaymentConfig {
	const rawMode = env.PAYMENT_MODE?.trim() ?? '';
	if (rawMode !== '' && rawMode !== 'fake' && rawMode !== 'provider') {
		throw new PaymentConfigError(`PAYMENT_MODE is "${rawMode.slice(0, 40)}"; set it to fake or provider.`);
	}
	const mode = rawMode === 'provider' ? 'provider' : 'fake';
	const secretKey = env.PAYMENT_SECRET_KEY?.trim() || '';
	const webhookSecret = env.PAYMENT_WEBHOOK_SECRET?.trim() || '';
	if (mode === 'provider') {
		const problems: string[] = [];
		const need = (name: string, value: string, published: string) => {
			if (!value) problems.push(`${name} is not set`);
			else if (value === published) problems.push(`${name} is the local fake's published value`);
		};
		need('PAYMENT_SECRET_KEY', secretKey, FAKE_SECRET_KEY);
		need('PAYMENT_WEBHOOK_SECRET', webhookSecret, FAKE_WEBHOOK_SECRET);
		if (problems.length) {
			throw new PaymentConfigError(`PAYMENT_MODE=provider needs the shop's own keys from the payment provider: ${problems.join('; ')}.`);
		}
	}
	return {
		mode,
		secretKey: secretKey || FAKE_SECRET_KEY,
		webhookSecret: webhookSecret || FAKE_WEBHOOK_SECRET,
		fakePort: Number(env.PAYMENT_FAKE_PORT ?? 0)
	};
}

/** The SDK client; `apiPort` is the local fake's port in fake mode. */
export function paymentClient(config: PaymentConfig, apiPort: number | null): Stripe {
	if (config.mode === 'fake') {
		if (!apiPort) throw new Error('the local payment fake is not running');
		return new Stripe(config.secretKey, { host: '127.0.0.1', port: apiPort, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
	}
	return new Stripe(config.secretKey, { maxNetworkRetries: 2, telemetry: false });
}

export class PaymentError extends Error {}

/** Start a checkout for the order's approved, unpaid quote; returns the provider's checkout URL. */
export async function startCheckout(db: Db, stripe: Stripe, orderId: number, returnUrl: string): Promise<string> {
	const order = db.select().from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get();
	const q = db.select().from(quote).where(eq(quote.orderId, orderId)).orderBy(desc(quote.id)).limit(1).get();
	if (!order || !q || q.status !== 'approved') throw new PaymentError('Approve the quote before paying.');
	if (q.paidAt) throw new PaymentError('This quote is already paid. Thank you.');
	const settings = getRebuildSettings(db);
	let session: { id: string; url?: string | null };
	try {
		session = await stripe.checkout.sessions.create({
			mode: 'payment',
			client_reference_id: `quote-${q.id}`,
			metadata: { quoteId: String(q.id), orderCode: order.code },
			line_items: [
				{
					quantity: 1,
					price_data: { currency: settings.currency.toLowerCase(), unit_amount: q.totalCents, product_data: { name: `Rebuild ${order.code}` } }
				}
			],
			success_url: `${returnUrl}?paid=1`,
			cancel_url: returnUrl
		});
	} catch (e) {
		throw new PaymentError(`The payment service did not answer (${e instanceof Error ? e.message : String(e)}); try again in a minute.`);
	}
	if (!session.url) throw new PaymentError('The payment service gave no checkout page; try again.');
	db.update(quote).set({ checkoutSessionId: session.id }).where(eq(quote.id, q.id)).run();
	return session.url;
}

export type WebhookOutcome =
	| { status: 400; code: 'bad_signature' | 'bad_event'; message: string }
	| { status: 200; result: 'paid' | 'replayed' | 'ignored' };

/** Verify and apply one webhook delivery. `payload` is the raw body, exactly as received. */
const webhookEventSchema = z.object({
	id: z.string().min(1).max(255),
	type: z.string().min(1).max(255),
	data: z.object({ object: z.record(z.string(), z.unknown()) })
});

export function handlePaymentWebhook(
	db: Db,
	stripe: Stripe,
	webhookSecret: string,
	payload: string,
	signature: string | null,
	now: Date = new Date()
): WebhookOutcome {
	let event: { id: string; type: string; data: { object: unknown } };
	try {
		event = stripe.webhooks.constructEvent(payload, signature ?? '', webhookSecret) as typeof event;
	} catch {
		return { status: 400, code: 'bad_signature', message: 'The webhook signature does not verify.' };
	}
	// a signed body is still checked for the fields read below before anything is written
	const shape = webhookEventSchema.safeParse(event);
	if (!shape.success) return { status: 400, code: 'bad_event', message: 'The webhook event lacks an id, a type or its data object.' };
	return db.transaction(
		(tx): WebhookOutcome => {
			const seen = tx.select().from(paymentEvent).where(eq(paymentEvent.id, event.id)).get();
			if (seen) return { status: 200, result: 'replayed' };
			let result: 'paid' | 'ignored' = 'ignored';
			let quoteId: number | null = null;
			if (event.type === 'checkout.session.completed') {
				const s = event.data.object as { id: string; payment_status?: string; amount_total?: number; metadata?: Record<string, string> };
				const id = Number(s.metadata?.quoteId);
				const q = Number.isInteger(id) ? tx.select().from(quote).where(eq(quote.id, id)).get() : undefined;
				if (q) quoteId = q.id;
				if (q && q.status === 'approved' && !q.paidAt && q.checkoutSessionId === s.id && s.payment_status === 'paid' && s.amount_total === q.totalCents) {
					tx.update(quote).set({ paidAt: now, paidCents: s.amount_total }).where(eq(quote.id, q.id)).run();
					result = 'paid';
				}
			}
			tx.insert(paymentEvent).values({ id: event.id, type: event.type, quoteId, receivedAt: now }).run();
			return { status: 200, result };
		},
		{ behavior: 'immediate' }
	);
}
