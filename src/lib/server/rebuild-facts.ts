/** Facts about a customer's unit for the guards: is it one, and what became of its quote. */
import { desc, eq, sql } from 'drizzle-orm';
import type { UnitFacts } from '../domain/units/guards';
import type { DbOrTx } from './db';
import { prepared } from './db/prepared';
import { quote, rebuildOrder, type Unit } from './db/schema';

/** The rebuild order a unit belongs to, if any (asked on every move that may notify). */
export const orderOfUnit = (d: DbOrTx) =>
	prepared(d, 'rebuild.orderOfUnit', (d) => d.select().from(rebuildOrder).where(eq(rebuildOrder.unitId, sql.placeholder('unitId'))).prepare());

export function customerQuoteFacts(tx: DbOrTx, unitRow: Unit): Partial<UnitFacts> {
	const order = orderOfUnit(tx).get({ unitId: unitRow.id });
	if (!order) return { customerUnit: false, quoteApproved: null, quoteDeclined: false };
	const latest = tx
		.select({ status: quote.status })
		.from(quote)
		.where(eq(quote.orderId, order.id))
		.orderBy(desc(quote.id))
		.limit(1)
		.get();
	return {
		customerUnit: true,
		quoteApproved: latest?.status === 'approved',
		quoteDeclined: latest?.status === 'declined'
	};
}
