/**
 * Customer rebuild orders: the office takes in a customer's unit and opens its order in
 * one step (unit received into the day's customer-return lot, order, status link and the
 * first e-mail in one transaction), and the views the office and the customer read.
 */
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Db, DbOrTx } from './db';
import {
	coreLot,
	outboxMessage,
	quote,
	quoteLine,
	rebuildOrder,
	shipment,
	shipmentUnit,
	turboModel,
	unit,
	type RebuildOrder
} from './db/schema';
import { queueNotice } from './rebuild-notify';
import { issueTrackLink, liveLink, revokeTrackLinks } from './track-links';
import { receiveUnits, type Actor } from './units';
import { publicBaseUrl } from './rebuild-settings';
import { INTAKE_ROLES } from '../domain/auth/roles';
import { NOTICE_KINDS } from '../domain/customer/progress';
import { readyEstimate, type ReadyEstimate } from './flow-estimate';
import { sharedPhotos, type CustomerPhoto } from './photo-sharing';

const trimmed = (max: number, what: string) =>
	z
		.string({ error: `Give the ${what}.` })
		.trim()
		.min(1, `Give the ${what}.`)
		.max(max, `Keep the ${what} under ${max} characters.`);

export const newOrderSchema = z.object({
	customerName: trimmed(120, "customer's name"),
	email: z.string().trim().toLowerCase().email('Give an e-mail address the customer reads.').max(200),
	phone: z.string().trim().max(40, 'Keep the phone number under 40 characters.').default(''),
	shipAddress: trimmed(500, 'shipping address'),
	modelCode: trimmed(40, 'model'),
	originalTag: trimmed(80, 'tag as received'),
	complaint: trimmed(1000, 'complaint'),
	promisedOn: z
		.string()
		.trim()
		.regex(/^(\d{4}-\d{2}-\d{2})?$/, 'Give the promised date as a date.')
		.default(''),
	notifyReceived: z.boolean().default(true),
	notifyQuote: z.boolean().default(true),
	notifyInWork: z.boolean().default(true),
	notifyShipped: z.boolean().default(true)
});
export type NewOrder = z.infer<typeof newOrderSchema>;

export class OrderError extends Error {
	constructor(
		message: string,
		readonly field?: string
	) {
		super(message);
	}
}

export function trackUrl(token: string): string {
	return `${publicBaseUrl()}/track/${token}`;
}

function todaysCustomerLot(tx: DbOrTx, now: Date): number {
	const day = now.toISOString().slice(0, 10);
	const code = `CR${day.slice(2).replaceAll('-', '')}`;
	const found = tx.select({ id: coreLot.id }).from(coreLot).where(eq(coreLot.code, code)).get();
	if (found) return found.id;
	return tx
		.insert(coreLot)
		.values({ code, source: 'customer_return', receivedOn: day, notes: "Customers' own units for rebuild.", createdAt: now })
		.returning({ id: coreLot.id })
		.get().id;
}

function nextOrderCode(tx: DbOrTx, now: Date): string {
	const year = now.toISOString().slice(2, 4);
	const n = tx.select({ n: sql<number>`count(*)` }).from(rebuildOrder).get()?.n ?? 0;
	for (let i = n + 1; ; i++) {
		const code = `RO-${year}-${String(i).padStart(4, '0')}`;
		if (!tx.select({ id: rebuildOrder.id }).from(rebuildOrder).where(eq(rebuildOrder.code, code)).get()) return code;
	}
}

/**
 * Take in a customer's unit and open its order. Returns the order, the unit's serial and the
 * status-link token (shown once; only its hash is kept).
 */
export function createRebuildOrder(
	db: Db,
	actor: Actor,
	input: NewOrder,
	now: Date = new Date()
): { order: RebuildOrder; serial: string; token: string } {
	if (!INTAKE_ROLES.includes(actor.role)) throw new OrderError(`A ${actor.role} cannot take in customer units.`);
	const model = db.select().from(turboModel).where(eq(turboModel.code, input.modelCode)).get();
	if (!model || !model.active) throw new OrderError(`No model ${input.modelCode}.`, 'modelCode');
	return db.transaction(
		() => {
			const lotId = todaysCustomerLot(db, now);
			const [serial] = receiveUnits(db, actor, lotId, [{ modelId: model.id, originalTag: input.originalTag, notes: '' }], now);
			const unitRow = db.select().from(unit).where(eq(unit.serial, serial)).get()!;
			const order = db
				.insert(rebuildOrder)
				.values({
					code: nextOrderCode(db, now),
					customerName: input.customerName,
					email: input.email,
					phone: input.phone,
					shipAddress: input.shipAddress,
					complaint: input.complaint,
					promisedOn: input.promisedOn || null,
					unitId: unitRow.id,
					notifyReceived: input.notifyReceived,
					notifyQuote: input.notifyQuote,
					notifyInWork: input.notifyInWork,
					notifyShipped: input.notifyShipped,
					createdBy: actor.id,
					createdAt: now
				})
				.returning()
				.get();
			const token = issueTrackLink(db, order.id, now);
			queueNotice(db, order, 'received', { link: trackUrl(token) }, now);
			return { order, serial, token };
		},
		{ behavior: 'immediate' }
	);
}

/** Revoke the order's link and e-mail a new one (always sent: the office asked for it). */
export function resendTrackLink(db: Db, orderId: number, now: Date = new Date()): string {
	return db.transaction(
		(tx) => {
			const order = tx.select().from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get();
			if (!order) throw new OrderError('No such order.');
			const token = issueTrackLink(tx, orderId, now);
			queueNotice(tx, order, 'received', { link: trackUrl(token) }, now, true);
			return token;
		},
		{ behavior: 'immediate' }
	);
}

export function revokeOrderLinks(db: Db, orderId: number, now: Date = new Date()): number {
	return db.transaction((tx) => revokeTrackLinks(tx, orderId, now), { behavior: 'immediate' });
}

export const prefsSchema = z.object(Object.fromEntries(NOTICE_KINDS.map((k) => [k, z.boolean().default(false)])) as Record<
	(typeof NOTICE_KINDS)[number],
	z.ZodDefault<z.ZodBoolean>
>);

export function setNoticePrefs(db: DbOrTx, orderId: number, prefs: Record<(typeof NOTICE_KINDS)[number], boolean>): void {
	db.update(rebuildOrder)
		.set({
			notifyReceived: prefs.received,
			notifyQuote: prefs.quote_ready,
			notifyInWork: prefs.in_work,
			notifyShipped: prefs.shipped
		})
		.where(eq(rebuildOrder.id, orderId))
		.run();
}

export interface OrderListRow {
	id: number;
	code: string;
	customerName: string;
	serial: string;
	state: string;
	quoteStatus: string | null;
	paid: boolean;
	promisedOn: string | null;
	createdAt: string;
}

export function listOrders(db: DbOrTx): OrderListRow[] {
	const rows = db
		.select({
			id: rebuildOrder.id,
			code: rebuildOrder.code,
			customerName: rebuildOrder.customerName,
			serial: unit.serial,
			state: unit.state,
			promisedOn: rebuildOrder.promisedOn,
			createdAt: rebuildOrder.createdAt,
			quoteStatus: sql<string | null>`(select q.status from quote q where q.order_id = ${rebuildOrder.id} order by q.id desc limit 1)`,
			paidAt: sql<number | null>`(select q.paid_at from quote q where q.order_id = ${rebuildOrder.id} order by q.id desc limit 1)`
		})
		.from(rebuildOrder)
		.innerJoin(unit, eq(unit.id, rebuildOrder.unitId))
		.orderBy(desc(rebuildOrder.id))
		.all();
	return rows.map((r) => ({ ...r, paid: r.paidAt != null, createdAt: r.createdAt.toISOString() }));
}

export function latestQuote(db: DbOrTx, orderId: number) {
	const q = db.select().from(quote).where(eq(quote.orderId, orderId)).orderBy(desc(quote.id)).limit(1).get();
	if (!q) return null;
	const lines = db.select().from(quoteLine).where(eq(quoteLine.quoteId, q.id)).orderBy(asc(quoteLine.sortOrder), asc(quoteLine.id)).all();
	return { ...q, lines };
}

function shipmentFor(db: DbOrTx, unitId: number) {
	return (
		db
			.select({ code: shipment.code, carrier: shipment.carrier, trackingNumber: shipment.trackingNumber, createdAt: shipment.createdAt })
			.from(shipmentUnit)
			.innerJoin(shipment, eq(shipment.id, shipmentUnit.shipmentId))
			.where(eq(shipmentUnit.unitId, unitId))
			.get() ?? null
	);
}

/** Everything the office sees about an order. */
export function orderDetail(db: DbOrTx, orderId: number, now: Date = new Date()) {
	const order = db.select().from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get();
	if (!order) return null;
	const u = db
		.select({ serial: unit.serial, state: unit.state, held: unit.held, originalTag: unit.originalTag, modelCode: turboModel.code, version: unit.version })
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(unit.id, order.unitId))
		.get()!;
	const mail = db
		.select({
			id: outboxMessage.id,
			kind: outboxMessage.kind,
			subject: outboxMessage.subject,
			status: outboxMessage.status,
			attempts: outboxMessage.attempts,
			lastError: outboxMessage.lastError,
			sentAt: outboxMessage.sentAt,
			createdAt: outboxMessage.createdAt
		})
		.from(outboxMessage)
		.where(eq(outboxMessage.orderId, orderId))
		.orderBy(desc(outboxMessage.id))
		.all();
	const link = liveLink(db, orderId, now);
	return {
		order: { ...order, createdAt: order.createdAt.toISOString() },
		unit: u,
		quote: latestQuote(db, orderId),
		shipment: shipmentFor(db, order.unitId),
		link: link ? { createdAt: link.createdAt.toISOString(), expiresAt: link.expiresAt.toISOString() } : null,
		mail: mail.map((m) => ({ ...m, sentAt: m.sentAt?.toISOString() ?? null, createdAt: m.createdAt.toISOString() }))
	};
}

export interface TrackView {
	orderCode: string;
	customerName: string;
	promisedOn: string | null;
	unit: { serial: string; modelCode: string; originalTag: string; state: string; held: boolean };
	estimate: ReadyEstimate;
	quote: {
		status: string;
		lines: { kind: string; description: string; quantityHundredths: number; unitPriceCents: number }[];
		taxRateBp: number;
		coreCents: number;
		coreNote: string;
		subtotalCents: number;
		taxCents: number;
		totalCents: number;
		paid: boolean;
		paidCents: number | null;
	} | null;
	declineChoice: string | null;
	shipment: { carrier: string; trackingNumber: string; shippedOn: string } | null;
	prefs: Record<(typeof NOTICE_KINDS)[number], boolean>;
	/** Photos the office chose to share, with their captions. */
	photos: CustomerPhoto[];
}

/**
 * What the customer may see: their own order and unit, the quote once sent, the shipment.
 * Never internal notes, the history's people or stations, or anything of another order.
 */
export function trackView(db: DbOrTx, orderId: number, now: Date = new Date()): TrackView | null {
	const order = db.select().from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get();
	if (!order) return null;
	const u = db
		.select({ serial: unit.serial, state: unit.state, held: unit.held, originalTag: unit.originalTag, modelCode: turboModel.code, stateSince: unit.stateSince })
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(unit.id, order.unitId))
		.get()!;
	const q = latestQuote(db, orderId);
	const s = shipmentFor(db, order.unitId);
	return {
		orderCode: order.code,
		customerName: order.customerName,
		promisedOn: order.promisedOn,
		unit: { serial: u.serial, modelCode: u.modelCode, originalTag: u.originalTag, state: u.state, held: u.held },
		estimate: readyEstimate(db, u.state, u.stateSince, now),
		quote:
			q && q.status !== 'draft'
				? {
						status: q.status,
						lines: q.lines.map((l) => ({ kind: l.kind, description: l.description, quantityHundredths: l.quantityHundredths, unitPriceCents: l.unitPriceCents })),
						taxRateBp: q.taxRateBp,
						coreCents: q.coreCents,
						coreNote: q.coreNote,
						subtotalCents: q.subtotalCents,
						taxCents: q.taxCents,
						totalCents: q.totalCents,
						paid: q.paidAt != null,
						paidCents: q.paidCents
					}
				: null,
		declineChoice: order.declineChoice,
		shipment: s ? { carrier: s.carrier, trackingNumber: s.trackingNumber, shippedOn: s.createdAt.toISOString().slice(0, 10) } : null,
		prefs: { received: order.notifyReceived, quote_ready: order.notifyQuote, in_work: order.notifyInWork, shipped: order.notifyShipped },
		photos: sharedPhotos(db, orderId)
	};
}

export function orderForUnit(db: DbOrTx, unitId: number) {
	return db.select().from(rebuildOrder).where(and(eq(rebuildOrder.unitId, unitId))).get() ?? null;
}
