/** Facts about a customer's unit for the guards: is it one, and what became of its quote. */
import { desc, eq } from 'drizzle-orm';
import type { UnitFacts } from '../domain/units/guards';
import type { DbOrTx } from './db';
import { quote, rebuildOrder, type Unit } from './db/schema';

export function customerQuoteFacts(tx: DbOrTx, unitRow: Unit): Partial<UnitFacts> {
	const order = tx.select({ id: rebuildOrder.id }).from(rebuildOrder).where(eq(rebuildOrder.unitId, unitRow.id)).get();
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
