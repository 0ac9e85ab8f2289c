/**
 * The long-lived helpers behind customer orders, started once from the server's `init`
 * hook: the local SMTP fake (when mail is in fake mode), the outbox sender loop, and the
 * local payment fake (when payments are in fake mode). All bind to 127.0.0.1 only and stop
 * on the server's shutdown signal.
 */
import type Stripe from 'stripe';
import type { Db } from './db';
import { mailConfig, smtpTransport, startSmtpFake, type SmtpFake } from './mail';
import { OutboxSender } from './outbox';
import { paymentClient, paymentConfig } from './payments';
import { startPaymentFake, type PaymentFake } from './payment-fake';
import { publicBaseUrl } from './rebuild-settings';

interface Running {
	smtpFake: SmtpFake | null;
	sender: OutboxSender | null;
	paymentFake: PaymentFake | null;
	stripe: Stripe;
	stop(): Promise<void>;
}

let running: Running | null = null;

export async function startCustomerServices(db: Db): Promise<Running> {
	if (running) return running;
	const mail = mailConfig();
	const pay = paymentConfig();
	const smtpFake = mail.mode === 'fake' ? await startSmtpFake(db, mail.fakePort) : null;
	const sender =
		mail.mode === 'off'
			? null
			: new OutboxSender(db, smtpTransport(mail, smtpFake?.port), {
					from: mail.from,
					pollMs: Number(process.env.OUTBOX_POLL_MS ?? 1000),
					// how long a claimed message waits before another sender (or this one after a restart) takes it again
					leaseMs: Number(process.env.OUTBOX_LEASE_MS ?? 120_000)
				});
	sender?.start();
	const webhookUrl = `${publicBaseUrl().replace('//localhost', '//127.0.0.1')}/api/payments/webhook`;
	const paymentFake =
		pay.mode === 'fake' ? await startPaymentFake({ port: pay.fakePort, secretKey: pay.secretKey, webhookSecret: pay.webhookSecret, webhookUrl }) : null;
	const stripe = paymentClient(pay, paymentFake?.port ?? null);
	const stop = async () => {
		await sender?.stop();
		await smtpFake?.close();
		await paymentFake?.close();
		running = null;
	};
	running = { smtpFake, sender, paymentFake, stripe, stop };
	process.once('sveltekit:shutdown' as 'exit', () => void stop());
	return running;
}

export function customerServices(): Running | null {
	return running;
}

/** The dev mail page exists only while the SMTP fake runs. */
export function mailFakeEnabled(): boolean {
	return !!running?.smtpFake;
}

/** Nudge the outbox sender after a commit that queued mail. */
export function pokeOutbox(): void {
	running?.sender?.poke();
}
