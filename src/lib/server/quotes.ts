/**
 * Quotes for customers' units: the office drafts lines after the teardown verdict, sends
 * the quote (totals fixed at the shop's tax rate, the customer e-mailed in the same
 * transaction), and the customer approves or declines it on the status page.
 */
import { desc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { parseMoney, parseQuantity, quoteTotals } from '../domain/customer/quote';
import type { Db } from './db';
import { quote, quoteLine, rebuildOrder, unit } from './db/schema';
import { queueNotice } from './rebuild-notify';
import { getRebuildSettings } from './rebuild-settings';
import { formatMoney } from '../domain/customer/quote';

export class QuoteError extends Error {}

export const lineFormSchema = z.object({
	kind: z.enum(['part', 'labour'], { error: 'Choose part or labour.' }),
	description: z.string().trim().min(2, 'Describe the line.').max(200, 'Keep the description under 200 characters.'),
	quantity: z.string().trim().refine((v) => parseQuantity(v) !== null, 'Give a quantity above 0 with at most two decimals.'),
	unitPrice: z.string().trim().refine((v) => (parseMoney(v) ?? -1) >= 0, 'Give a price such as 125.00.')
});

function orderOrThrow(db: Db, orderId: number) {
	const order = db.select().from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get();
	if (!order) throw new QuoteError('No such order.');
	return order;
}

function latest(db: Db, orderId: number) {
	return db.select().from(quote).where(eq(quote.orderId, orderId)).orderBy(desc(quote.id)).limit(1).get() ?? null;
}

/** The order's draft, created when there is none yet; refused once a quote was sent. */
function editableDraft(db: Db, orderId: number) {
	const q = latest(db, orderId);
	if (q && q.status !== 'draft') throw new QuoteError(`The quote was already ${q.status}; it can no longer be changed.`);
	return q ?? db.insert(quote).values({ orderId, status: 'draft' }).returning().get();
}

/** The quote must still add up in whole cents with this change; refused with a sentence before anything is stored. */
function checkPriceable(db: Db, lines: Parameters<typeof quoteTotals>[0], coreCents: number): void {
	try {
		quoteTotals(lines, getRebuildSettings(db).taxRateBp, coreCents);
	} catch (e) {
		if (e instanceof RangeError) throw new QuoteError(`That amount is too large for a quote: ${e.message}`);
		throw e;
	}
}

export function addQuoteLine(db: Db, orderId: number, input: z.infer<typeof lineFormSchema>): void {
	db.transaction(
		() => {
			orderOrThrow(db, orderId);
			const q = editableDraft(db, orderId);
			const order = db.select({ n: sql<number>`count(*)` }).from(quoteLine).where(eq(quoteLine.quoteId, q.id)).get()?.n ?? 0;
			const line = { kind: input.kind, description: input.description, quantityHundredths: parseQuantity(input.quantity)!, unitPriceCents: parseMoney(input.unitPrice)! };
			const lines = db.select().from(quoteLine).where(eq(quoteLine.quoteId, q.id)).all();
			checkPriceable(db, [...lines, line], q.coreCents);
			db.insert(quoteLine)
				.values({ quoteId: q.id, ...line, sortOrder: order })
				.run();
		},
		{ behavior: 'immediate' }
	);
}

export function removeQuoteLine(db: Db, orderId: number, lineId: number): void {
	db.transaction(
		() => {
			const q = editableDraft(db, orderId);
			const line = db.select().from(quoteLine).where(eq(quoteLine.id, lineId)).get();
			if (!line || line.quoteId !== q.id) throw new QuoteError('That line is not on this quote.');
			db.delete(quoteLine).where(eq(quoteLine.id, lineId)).run();
		},
		{ behavior: 'immediate' }
	);
}

export function setQuoteCore(db: Db, orderId: number, coreCents: number, coreNote: string): void {
	db.transaction(
		() => {
			const q = editableDraft(db, orderId);
			checkPriceable(db, db.select().from(quoteLine).where(eq(quoteLine.quoteId, q.id)).all(), coreCents);
			db.update(quote).set({ coreCents, coreNote: coreNote.trim().slice(0, 200) }).where(eq(quote.id, q.id)).run();
		},
		{ behavior: 'immediate' }
	);
}

/** Fix the totals and show the quote to the customer; only after the teardown verdict accepted the unit. */
export function sendQuote(db: Db, orderId: number, now: Date = new Date()): void {
	db.transaction(
		() => {
			const order = orderOrThrow(db, orderId);
			const u = db.select().from(unit).where(eq(unit.id, order.unitId)).get()!;
			if (u.state !== 'accepted') {
				throw new QuoteError(`${u.serial} is ${u.state}; a quote goes out after teardown has accepted the unit.`);
			}
			const q = editableDraft(db, orderId);
			const lines = db.select().from(quoteLine).where(eq(quoteLine.quoteId, q.id)).all();
			if (lines.length === 0) throw new QuoteError('Add at least one parts or labour line before sending.');
			const settings = getRebuildSettings(db);
			const t = quoteTotals(lines, settings.taxRateBp, q.coreCents);
			if (t.totalCents <= 0) throw new QuoteError('The total must be above zero; check the core credit.');
			db.update(quote)
				.set({ status: 'sent', sentAt: now, taxRateBp: settings.taxRateBp, subtotalCents: t.subtotalCents, taxCents: t.taxCents, totalCents: t.totalCents })
				.where(eq(quote.id, q.id))
				.run();
			queueNotice(db, order, 'quote_ready', { quoteTotal: formatMoney(t.totalCents, settings.currency) }, now);
		},
		{ behavior: 'immediate' }
	);
}

/** Take a sent quote back to draft (before the customer decided). */
export function withdrawQuote(db: Db, orderId: number): void {
	db.transaction(
		() => {
			const q = latest(db, orderId);
			if (!q || q.status !== 'sent') throw new QuoteError('Only a sent quote the customer has not answered can be taken back.');
			db.update(quote).set({ status: 'draft', sentAt: null }).where(eq(quote.id, q.id)).run();
		},
		{ behavior: 'immediate' }
	);
}

export type CustomerDecision = { decision: 'approve' } | { decision: 'decline'; choice: 'return' | 'scrap' };

/** The customer's answer to a sent quote. */
export function decideQuote(db: Db, orderId: number, answer: CustomerDecision, now: Date = new Date()): 'approved' | 'declined' {
	return db.transaction(
		() => {
			const q = latest(db, orderId);
			if (!q || q.status !== 'sent') throw new QuoteError('There is no quote waiting for your answer.');
			if (answer.decision === 'approve') {
				db.update(quote).set({ status: 'approved', decidedAt: now }).where(eq(quote.id, q.id)).run();
				return 'approved' as const;
			}
			db.update(quote).set({ status: 'declined', decidedAt: now }).where(eq(quote.id, q.id)).run();
			db.update(rebuildOrder).set({ declineChoice: answer.choice }).where(eq(rebuildOrder.id, orderId)).run();
			return 'declined' as const;
		},
		{ behavior: 'immediate' }
	);
}
