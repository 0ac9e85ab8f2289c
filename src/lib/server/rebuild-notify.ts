/**
 * Customer e-mail for changes to an order's unit, written to the outbox inside the
 * transaction of the change. The customer's choices decide which changes e-mail them.
 */
import { desc, eq } from 'drizzle-orm';
import { renderNotice, type NoticeFacts } from '../domain/customer/mail-templates';
import { noticeForMove, type NoticeKind } from '../domain/customer/progress';
import { formatMoney } from '../domain/customer/quote';
import type { UnitState } from '../domain/units/states';
import type { DbOrTx } from './db';
import { quote, shipment, shipmentUnit, unit, type RebuildOrder, type Unit } from './db/schema';
import { enqueueMail } from './outbox';
import { orderOfUnit } from './rebuild-facts';
import { getRebuildSettings } from './rebuild-settings';

const WANTS: Record<NoticeKind, keyof RebuildOrder> = {
	received: 'notifyReceived',
	quote_ready: 'notifyQuote',
	in_work: 'notifyInWork',
	shipped: 'notifyShipped'
};

/** Queue a notice when the customer asked for it (or `force`, e.g. a link re-sent by the office). */
export function queueNotice(
	tx: DbOrTx,
	order: RebuildOrder,
	kind: NoticeKind,
	extra: Partial<NoticeFacts> = {},
	now: Date = new Date(),
	force = false
): boolean {
	if (!force && !order[WANTS[kind]]) return false;
	const serial = tx.select({ serial: unit.serial }).from(unit).where(eq(unit.id, order.unitId)).get()?.serial ?? '';
	const settings = getRebuildSettings(tx);
	const mail = renderNotice(kind, {
		shopName: settings.shopName,
		customerName: order.customerName,
		orderCode: order.code,
		serial,
		...extra
	});
	enqueueMail(tx, { kind, orderId: order.id, to: order.email, mail }, now);
	return true;
}

/** Called by `applyMove` inside its transaction, after the event is written. */
export function afterUnitMove(tx: DbOrTx, unitRow: Unit, action: string, to: UnitState, now: Date): void {
	const kind = noticeForMove(action, to);
	if (!kind) return;
	const order = orderOfUnit(tx).get({ unitId: unitRow.id });
	if (!order) return;
	const extra: Partial<NoticeFacts> = {};
	if (kind === 'shipped') {
		const s = tx
			.select({ carrier: shipment.carrier, trackingNumber: shipment.trackingNumber })
			.from(shipmentUnit)
			.innerJoin(shipment, eq(shipment.id, shipmentUnit.shipmentId))
			.where(eq(shipmentUnit.unitId, unitRow.id))
			.get();
		if (s) Object.assign(extra, s);
		extra.unrepaired = action === 'return';
	}
	queueNotice(tx, order, kind, extra, now);
}

export function quoteTotalText(tx: DbOrTx, orderId: number): string | null {
	const q = tx.select().from(quote).where(eq(quote.orderId, orderId)).orderBy(desc(quote.id)).limit(1).get();
	return q ? formatMoney(q.totalCents, getRebuildSettings(tx).currency) : null;
}
