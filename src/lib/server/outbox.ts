/**
 * The transactional outbox. `enqueueMail` is called inside the transaction that makes the
 * change the e-mail reports, so the message exists exactly when the change does. The
 * `OutboxSender` loop claims one due row at a time with a lease (in an immediate
 * transaction), sends it, and marks it sent; a failure is recorded and retried with
 * back-off, and given up after the last attempt. A row is only ever claimed by one sender;
 * a row left `sending` by a sender that died is taken again once its lease ran out.
 * Every message carries a stable Message-ID (`<outbox-ID@...>`), so a receiver can
 * recognise the one case no outbox can close: a crash after the SMTP server accepted the
 * message and before the row was marked sent.
 */
import { and, asc, eq, lte, or, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import type { Transporter } from 'nodemailer';
import { retryDelayMs, type BackoffPolicy, MAIL_BACKOFF } from '../domain/customer/backoff';
import type { RenderedMail } from '../domain/customer/mail-templates';
import type { Db, DbOrTx } from './db';
import { outboxMessage, type OutboxMessage } from './db/schema';

export function enqueueMail(
	tx: DbOrTx,
	msg: { kind: string; orderId?: number | null; to: string; mail: RenderedMail },
	now: Date = new Date()
): number {
	return tx
		.insert(outboxMessage)
		.values({
			kind: msg.kind,
			orderId: msg.orderId ?? null,
			toAddress: msg.to,
			subject: msg.mail.subject,
			textBody: msg.mail.text,
			htmlBody: msg.mail.html,
			status: 'pending',
			nextAttemptAt: now,
			createdAt: now
		})
		.returning({ id: outboxMessage.id })
		.get().id;
}

export interface SenderOptions {
	from: string;
	/** How long a claim lasts before another sender may take the row. */
	leaseMs?: number;
	pollMs?: number;
	backoff?: BackoffPolicy;
	owner?: string;
	clock?: () => Date;
}

export class OutboxSender {
	readonly owner: string;
	private timer: ReturnType<typeof setTimeout> | null = null;
	private running = false;
	private inFlight: Promise<unknown> | null = null;
	private readonly leaseMs: number;
	private readonly pollMs: number;
	private readonly backoff: BackoffPolicy;
	private readonly clock: () => Date;

	constructor(
		private readonly db: Db,
		private readonly transport: Pick<Transporter, 'sendMail'>,
		private readonly options: SenderOptions
	) {
		this.owner = options.owner ?? `sender-${randomUUID()}`;
		this.leaseMs = options.leaseMs ?? 120_000;
		this.pollMs = options.pollMs ?? 1000;
		this.backoff = options.backoff ?? MAIL_BACKOFF;
		this.clock = options.clock ?? (() => new Date());
	}

	/** Claim the oldest due message, or null when nothing is due. */
	claim(): OutboxMessage | null {
		const now = this.clock();
		return this.db.transaction(
			(tx) => {
				const due = tx
					.select({ id: outboxMessage.id })
					.from(outboxMessage)
					.where(
						or(
							and(eq(outboxMessage.status, 'pending'), lte(outboxMessage.nextAttemptAt, now)),
							and(eq(outboxMessage.status, 'sending'), lte(outboxMessage.leaseUntil, now))
						)
					)
					.orderBy(asc(outboxMessage.nextAttemptAt), asc(outboxMessage.id))
					.limit(1)
					.get();
				if (!due) return null;
				return (
					tx
						.update(outboxMessage)
						.set({
							status: 'sending',
							leaseOwner: this.owner,
							leaseUntil: new Date(now.getTime() + this.leaseMs),
							attempts: sql`${outboxMessage.attempts} + 1`
						})
						.where(eq(outboxMessage.id, due.id))
						.returning()
						.get() ?? null
				);
			},
			{ behavior: 'immediate' }
		);
	}

	/** Send one claimed message and record the outcome. */
	async deliver(msg: OutboxMessage): Promise<'sent' | 'retry' | 'failed'> {
		try {
			await this.transport.sendMail({
				from: this.options.from,
				to: msg.toAddress,
				subject: msg.subject,
				text: msg.textBody,
				html: msg.htmlBody,
				messageId: `<outbox-${msg.id}.${msg.createdAt.getTime()}@spoolyard.invalid>`
			});
		} catch (e) {
			const delay = retryDelayMs(msg.attempts, this.backoff);
			const now = this.clock();
			const error = (e instanceof Error ? e.message : String(e)).slice(0, 500);
			this.db
				.update(outboxMessage)
				.set(
					delay === null
						? { status: 'failed', lastError: error, leaseOwner: null, leaseUntil: null }
						: { status: 'pending', lastError: error, leaseOwner: null, leaseUntil: null, nextAttemptAt: new Date(now.getTime() + delay) }
				)
				.where(and(eq(outboxMessage.id, msg.id), eq(outboxMessage.leaseOwner, this.owner)))
				.run();
			return delay === null ? 'failed' : 'retry';
		}
		this.db
			.update(outboxMessage)
			.set({ status: 'sent', sentAt: this.clock(), leaseOwner: null, leaseUntil: null, lastError: null })
			.where(and(eq(outboxMessage.id, msg.id), eq(outboxMessage.leaseOwner, this.owner)))
			.run();
		return 'sent';
	}

	/** Claim and deliver until nothing is due (at most `limit`); returns how many were tried. */
	async drain(limit = Infinity): Promise<number> {
		let n = 0;
		while (n < limit) {
			const msg = this.claim();
			if (!msg) break;
			await this.track(this.deliver(msg));
			n += 1;
		}
		return n;
	}

	private async track<T>(p: Promise<T>): Promise<T> {
		this.inFlight = p;
		try {
			return await p;
		} finally {
			this.inFlight = null;
		}
	}

	start(): void {
		if (this.running) return;
		this.running = true;
		this.schedule(0);
	}

	private schedule(ms: number) {
		if (!this.running) return;
		if (this.timer) clearTimeout(this.timer);
		this.timer = setTimeout(() => void this.tick(), ms);
		this.timer.unref?.();
	}

	private ticking = false;

	private async tick() {
		this.timer = null;
		if (!this.running || this.ticking) return;
		this.ticking = true;
		try {
			while (this.running) {
				const msg = this.claim();
				if (!msg) break;
				await this.track(this.deliver(msg));
			}
		} catch (e) {
			console.error('outbox sender:', e);
		} finally {
			this.ticking = false;
		}
		this.schedule(this.pollMs);
	}

	/** Look now instead of at the next poll (after a commit that enqueued mail). */
	poke(): void {
		if (this.running && !this.ticking) this.schedule(0);
	}

	/** Stop claiming; wait until a message in flight is recorded. */
	async stop(): Promise<void> {
		this.running = false;
		if (this.timer) clearTimeout(this.timer);
		this.timer = null;
		if (this.inFlight) await this.inFlight.catch(() => undefined);
	}
}
