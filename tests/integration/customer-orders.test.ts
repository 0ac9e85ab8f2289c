import { eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { expect, test } from 'vitest';
import { outboxMessage, quote, rebuildOrder, unit } from '../../src/lib/server/db/schema';
import { addQuoteLine, decideQuote, sendQuote, QuoteError } from '../../src/lib/server/quotes';
import { applyMove } from '../../src/lib/server/units';
import { trackView } from '../../src/lib/server/rebuild-orders';
import { customerShop, newOrder, walk } from '../helpers/customer';

test('intake: order, unit, link and the first e-mail in one step; bad input saves nothing', () => {
	const shop = customerShop();
	const { order, serial, token } = newOrder(shop);
	expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
	expect(Buffer.from(token, 'base64url')).toHaveLength(32);
	const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	expect(order.unitId).toBe(u.id);
	const mail = shop.db.select().from(outboxMessage).where(eq(outboxMessage.orderId, order.id)).all();
	expect(mail).toHaveLength(1);
	expect(mail[0]).toMatchObject({ kind: 'received', status: 'pending', toAddress: order.email });
	expect(mail[0].textBody).toContain(`/track/${token}`);
	expect(mail[0].subject).toContain('Test Turbo Shop');

	const before = shop.db.select().from(unit).all().length;
	expect(() => newOrder(shop, { modelCode: 'NO-SUCH' })).toThrow('No model');
	expect(shop.db.select().from(unit).all()).toHaveLength(before);
	expect(shop.db.select().from(rebuildOrder).all()).toHaveLength(1);
});

test('the customer may ask for no e-mail on receipt', () => {
	const shop = customerShop();
	const { order } = newOrder(shop, { notifyReceived: false });
	expect(shop.db.select().from(outboxMessage).where(eq(outboxMessage.orderId, order.id)).all()).toHaveLength(0);
});

test('quote after qualification; no work before approval; approval lets the floor move on and e-mails "in work"', () => {
	const shop = customerShop();
	const { order, serial } = newOrder(shop);
	addQuoteLine(shop.db, order.id, { kind: 'part', description: 'Bearing kit', quantity: '1', unitPrice: '89.50' });
	expect(() => sendQuote(shop.db, order.id)).toThrow(QuoteError); // still received
	walk(shop, serial, ['inspect', 'accept']);
	const early = applyMove(shop.db, shop.actors.lead, { serial, action: 'clean', idempotencyKey: randomUUID() });
	expect(early).toMatchObject({ ok: false, status: 409 });
	expect(!early.ok && early.message).toContain('quote must be approved');

	addQuoteLine(shop.db, order.id, { kind: 'labour', description: 'Rebuild', quantity: '2.5', unitPrice: '95' });
	sendQuote(shop.db, order.id);
	const q = shop.db.select().from(quote).where(eq(quote.orderId, order.id)).get()!;
	expect(q).toMatchObject({ status: 'sent', subtotalCents: 32700, taxCents: 2698, totalCents: 35398, taxRateBp: 825 });
	expect(trackView(shop.db, order.id)!.quote!.totalCents).toBe(35398);
	expect(shop.db.select().from(outboxMessage).where(eq(outboxMessage.kind, 'quote_ready')).all()).toHaveLength(1);
	expect(() => addQuoteLine(shop.db, order.id, { kind: 'part', description: 'Late', quantity: '1', unitPrice: '1' })).toThrow('already sent');

	expect(decideQuote(shop.db, order.id, { decision: 'approve' })).toBe('approved');
	expect(() => decideQuote(shop.db, order.id, { decision: 'approve' })).toThrow(QuoteError);
	walk(shop, serial, ['clean']);
	expect(shop.db.select().from(outboxMessage).where(eq(outboxMessage.kind, 'in_work')).all()).toHaveLength(1);
});

test('the customer view shows nothing internal and nothing of another order', () => {
	const shop = customerShop();
	const a = newOrder(shop, { customerName: 'Alpha Person' });
	newOrder(shop, { customerName: 'Beta Person' });
	walk(shop, a.serial, ['hold'], { reason: 'Internal: waiting for a wheel from stores' });
	const view = trackView(shop.db, a.order.id)!;
	const text = JSON.stringify(view);
	expect(text).toContain('Alpha Person');
	expect(text).not.toContain('Beta Person');
	expect(text).not.toContain('Internal');
	expect(text).not.toContain('Test lead');
	expect(view.unit.held).toBe(true);
});
