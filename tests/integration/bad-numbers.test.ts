/** Meaningless numbers that reach the arithmetic from a request answer 400 with a sentence, and nothing is stored. */
import { eq } from 'drizzle-orm';
import { expect, test } from 'vitest';
import { pChart } from '../../src/lib/domain/stats/p-chart';
import { badNumberMessage, badNumbersAs400 } from '../../src/lib/server/bad-numbers';
import { quote, quoteLine } from '../../src/lib/server/db/schema';
import { addQuoteLine, QuoteError, setQuoteCore } from '../../src/lib/server/quotes';
import { customerShop, newOrder } from '../helpers/customer';

test('a quote line whose amount does not fit in whole cents is refused with a sentence and not stored', () => {
	const shop = customerShop();
	const { order } = newOrder(shop);
	addQuoteLine(shop.db, order.id, { kind: 'part', description: 'Bearing kit', quantity: '1', unitPrice: '89.50' });
	// 999,999.99 × 999,999,999.99 = about 1e15 dollars: more cents than a double counts exactly.
	expect(() => addQuoteLine(shop.db, order.id, { kind: 'part', description: 'Gold', quantity: '999999.99', unitPrice: '999999999.99' })).toThrow(QuoteError);
	expect(() => addQuoteLine(shop.db, order.id, { kind: 'part', description: 'Gold', quantity: '999999.99', unitPrice: '999999999.99' })).toThrow(/too large for a quote/);
	const q = shop.db.select().from(quote).where(eq(quote.orderId, order.id)).get()!;
	expect(shop.db.select().from(quoteLine).where(eq(quoteLine.quoteId, q.id)).all()).toHaveLength(1);
	// a core charge that pushes the total past whole cents is refused the same way, and the draft keeps its old core
	expect(() => setQuoteCore(shop.db, order.id, 9_007_199_254_740_991, 'huge')).toThrow(QuoteError);
	expect(shop.db.select().from(quote).where(eq(quote.id, q.id)).get()!.coreCents).toBe(q.coreCents);
});

test('a JSON handler answers 400 with the sentence of a domain RangeError, and passes the engine’s own on', async () => {
	const res = await badNumbersAs400(() => {
		pChart([{ n: 10, defects: 12 }]);
		return new Response('never');
	});
	expect(res.status).toBe(400);
	expect(await res.json()).toEqual({ error: { code: 'invalid', message: 'Scrapped cores (12) cannot exceed cores judged (10).' } });
	await expect(
		badNumbersAs400(() => {
			throw new RangeError('Maximum call stack size exceeded');
		})
	).rejects.toThrow('Maximum call stack size exceeded');
	expect(badNumberMessage(new TypeError('x.'))).toBeNull();
});
