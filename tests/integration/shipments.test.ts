import { eq } from 'drizzle-orm';
import { PDFDocument } from 'pdf-lib';
import { expect, test } from 'vitest';
import { outboxMessage, shipLocation, shipment, unit, unitEvent } from '../../src/lib/server/db/schema';
import { ShipmentError, createShipment, listShipments, shipmentDetail, shippableUnits, stockByLocation } from '../../src/lib/server/shipments';
import { ROLES } from '../../src/lib/domain/auth/roles';
import { maySee } from '../../src/lib/server/access';
import { pdfText } from '../helpers/pdf-text';
import { packingSlipPdf } from '../../src/lib/server/packing-slip';
import { addQuoteLine, decideQuote, sendQuote } from '../../src/lib/server/quotes';
import { customerShop, newOrder, walk } from '../helpers/customer';

const TO_PACKED = ['inspect', 'accept', 'clean', 'machine', 'paint', 'assemble', 'balance', 'pack'] as const;

function stateOf(shop: ReturnType<typeof customerShop>, serial: string) {
	return shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!.state;
}

test('a shipment to a depot ships every unit in it, or none when one cannot go', async () => {
	const shop = customerShop();
	const [a, b, c] = shop.receive(3);
	walk(shop, a, [...TO_PACKED]);
	walk(shop, b, [...TO_PACKED]);
	walk(shop, c, ['inspect', 'accept']);
	const depot = shop.db.select().from(shipLocation).where(eq(shipLocation.name, 'Lakes Depot')).get()!;
	const base = { destination: 'distributor' as const, locationId: depot.id, reference: '', shipTo: '', carrier: 'Fenwick Parcel', trackingNumber: 'FP-0001' };

	expect(() => createShipment(shop.db, shop.actors.lead, { ...base, serials: [a, c] })).toThrow(ShipmentError);
	expect(stateOf(shop, a)).toBe('packed');
	expect(shop.db.select().from(shipment).all()).toHaveLength(0);
	expect(() => createShipment(shop.db, shop.actors.office, { ...base, serials: [a] })).toThrow('cannot send shipments');

	const made = createShipment(shop.db, shop.actors.lead, { ...base, serials: [a, b] });
	expect(stateOf(shop, a)).toBe('shipped');
	expect(stateOf(shop, b)).toBe('shipped');
	expect(stockByLocation(shop.db)).toEqual([{ location: 'Lakes Depot', modelCode: 'CH-F46', units: 2 }]);

	const detail = shipmentDetail(shop.db, made.id, 'lead')!;
	const pdf = await packingSlipPdf(detail, 'Test Turbo Shop');
	// the slip names the depot it goes to (read back through the PDF's own streams)
	expect(pdfText(pdf)).toContain('Lakes Depot');
	const doc = await PDFDocument.load(pdf);
	expect(doc.getPageCount()).toBe(1);
	expect(doc.getTitle()).toBe(`Packing slip ${made.code}`);
});

test('shipping a customer unit e-mails the tracking number; a declined one goes back unrepaired', () => {
	const shop = customerShop();
	const rebuilt = newOrder(shop);
	walk(shop, rebuilt.serial, ['inspect', 'accept']);
	addQuoteLine(shop.db, rebuilt.order.id, { kind: 'part', description: 'Kit', quantity: '1', unitPrice: '50' });
	sendQuote(shop.db, rebuilt.order.id);
	decideQuote(shop.db, rebuilt.order.id, { decision: 'approve' });
	walk(shop, rebuilt.serial, ['clean', 'machine', 'paint', 'assemble', 'balance', 'pack']);
	const [stock] = shop.receive(1);
	walk(shop, stock, [...TO_PACKED]);
	const toCustomer = { destination: 'customer' as const, orderId: rebuilt.order.id, reference: '', shipTo: '', carrier: 'Fenwick Parcel', trackingNumber: 'FP-7788' };
	expect(() => createShipment(shop.db, shop.actors.lead, { ...toCustomer, serials: [rebuilt.serial, stock] })).toThrow('shop stock');
	createShipment(shop.db, shop.actors.lead, { ...toCustomer, serials: [rebuilt.serial] });
	const shippedMail = shop.db.select().from(outboxMessage).where(eq(outboxMessage.kind, 'shipped')).all();
	expect(shippedMail).toHaveLength(1);
	expect(shippedMail[0].textBody).toContain('Tracking number: FP-7788');

	const declined = newOrder(shop);
	walk(shop, declined.serial, ['inspect', 'accept']);
	addQuoteLine(shop.db, declined.order.id, { kind: 'part', description: 'Housing', quantity: '1', unitPrice: '900' });
	sendQuote(shop.db, declined.order.id);
	expect(shippableUnits(shop.db, 'lead').some((u) => u.serial === declined.serial)).toBe(false);
	decideQuote(shop.db, declined.order.id, { decision: 'decline', choice: 'return' });
	expect(shippableUnits(shop.db, 'lead').find((u) => u.serial === declined.serial)).toMatchObject({ unrepaired: true });
	createShipment(shop.db, shop.actors.lead, { ...toCustomer, orderId: declined.order.id, trackingNumber: 'FP-7789', serials: [declined.serial] });
	expect(stateOf(shop, declined.serial)).toBe('shipped');
	const u = shop.db.select().from(unit).where(eq(unit.serial, declined.serial)).get()!;
	const last = shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all().at(-1)!;
	expect(last).toMatchObject({ action: 'return', fromState: 'accepted', toState: 'shipped', data: { unrepaired: true } });
	const back = shop.db.select().from(outboxMessage).where(eq(outboxMessage.orderId, declined.order.id)).all().at(-1)!;
	expect(back.textBody).toContain('unrepaired');
	expect(back.textBody).toContain('FP-7789');
});

test('where a shipment went, per role: the customer’s name and address for the office, the lead and the owner; the order or web-order number for a tech (list, detail and packing slip)', async () => {
	const shop = customerShop();
	const rebuilt = newOrder(shop, { customerName: 'Wenna Stroud', shipAddress: '3 Larchgate Mews\nCaddon Ferry' });
	walk(shop, rebuilt.serial, ['inspect', 'accept']);
	addQuoteLine(shop.db, rebuilt.order.id, { kind: 'part', description: 'Kit', quantity: '1', unitPrice: '50' });
	sendQuote(shop.db, rebuilt.order.id);
	decideQuote(shop.db, rebuilt.order.id, { decision: 'approve' });
	walk(shop, rebuilt.serial, ['clean', 'machine', 'paint', 'assemble', 'balance', 'pack']);
	const [stock] = shop.receive(1);
	walk(shop, stock, [...TO_PACKED]);
	const toCustomer = createShipment(shop.db, shop.actors.lead, { destination: 'customer', orderId: rebuilt.order.id, reference: '', shipTo: '', carrier: 'Fenwick Parcel', trackingNumber: 'FP-4411', serials: [rebuilt.serial] });
	const toBuyer = createShipment(shop.db, shop.actors.lead, { destination: 'web_order', reference: 'W-5521', shipTo: 'Quenby Marsh\n9 Sallow Row', carrier: 'Fenwick Parcel', trackingNumber: 'FP-4412', serials: [stock] });

	const seen: Record<string, boolean[]> = {};
	for (const role of ROLES) {
		const list = JSON.stringify(listShipments(shop.db, role));
		const one = shipmentDetail(shop.db, toCustomer.id, role)!;
		const web = shipmentDetail(shop.db, toBuyer.id, role)!;
		const slip = pdfText(await packingSlipPdf(one, 'Test Turbo Shop'));
		const webSlip = pdfText(await packingSlipPdf(web, 'Test Turbo Shop'));
		seen[role] = [list.includes('Wenna Stroud'), list.includes('Quenby Marsh'), one.shipment.shipTo.includes('Larchgate'), slip.includes('Wenna Stroud'), slip.includes('Larchgate Mews'), webSlip.includes('Sallow Row')];
		if (!maySee(role, 'customer')) {
			expect(one.shipment.shipTo).toBe(`Customer order ${rebuilt.order.code}`);
			expect(web.shipment.shipTo).toBe('Web order W-5521');
			expect(slip).toContain(`Customer order ${rebuilt.order.code}`);
		}
	}
	expect(seen).toEqual({ owner: Array(6).fill(true), office: Array(6).fill(true), lead: Array(6).fill(true), tech: Array(6).fill(false) });
	// the customer's unit on the shippable list carries the name only for those who may see it
	expect(shippableUnits(shop.db, 'tech').every((u) => u.customerName === null)).toBe(true);
});
