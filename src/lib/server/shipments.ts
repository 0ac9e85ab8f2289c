/**
 * Shipments: packed units (and customers' units going back unrepaired) leave in a shipment
 * to a distributor location, a web order, or the customer. One transaction writes the
 * shipment and makes every unit's move through `applyMove` (ship, or return for an
 * unrepaired customer unit); if any unit is refused, nothing is saved.
 */
import { and, asc, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { Db, DbOrTx } from './db';
import { rebuildOrder, shipLocation, shipment, shipmentUnit, turboModel, unit, unitEvent } from './db/schema';
import { applyMove, type Actor } from './units';
import { STEERING_ROLES, type Role } from '../domain/auth/roles';
import { optionalNumber } from '../domain/input/fields';
import { maySee } from './access';

export const newShipmentSchema = z
	.object({
		destination: z.enum(['distributor', 'web_order', 'customer'], { error: 'Choose where it goes.' }),
		locationId: optionalNumber('Depot', { int: true, min: 1, notNumber: 'Choose the depot from the list.', whole: 'Choose the depot from the list.', range: 'Choose the depot from the list.' })
			.transform((v) => v ?? undefined)
			.optional(),
		orderId: optionalNumber('Customer order', { int: true, min: 1, notNumber: 'Choose the customer order from the list.', whole: 'Choose the customer order from the list.', range: 'Choose the customer order from the list.' })
			.transform((v) => v ?? undefined)
			.optional(),
		reference: z.string().trim().max(60).default(''),
		shipTo: z.string().trim().max(500).default(''),
		carrier: z.string().trim().min(2, 'Give the carrier.').max(60),
		trackingNumber: z.string().trim().min(4, 'Give the tracking number.').max(60).regex(/^[A-Za-z0-9 -]+$/, 'A tracking number is letters, digits, spaces and dashes.'),
		serials: z.array(z.string().regex(/^SY-\d{5}$/)).min(1, 'Choose at least one unit.').max(200)
	})
	.superRefine((v, ctx) => {
		if (v.destination === 'distributor' && !v.locationId) ctx.addIssue({ code: 'custom', path: ['locationId'], message: 'Choose the depot.' });
		if (v.destination === 'web_order' && (!v.reference || !v.shipTo)) ctx.addIssue({ code: 'custom', path: ['reference'], message: 'Give the web order number and address.' });
		if (v.destination === 'customer' && !v.orderId) ctx.addIssue({ code: 'custom', path: ['orderId'], message: 'Choose the customer order.' });
	});
export type NewShipment = z.infer<typeof newShipmentSchema>;

export class ShipmentError extends Error {}

/** Units that can go out now: packed ones, and customers' units whose quote was declined with "send it back". The customer's name only for roles that may see customers. */
export function shippableUnits(db: DbOrTx, role: Role) {
	const customers = maySee(role, 'customer');
	const rows = db
		.select({
			serial: unit.serial,
			state: unit.state,
			modelCode: turboModel.code,
			originalTag: unit.originalTag,
			orderId: rebuildOrder.id,
			orderCode: rebuildOrder.code,
			customerName: rebuildOrder.customerName,
			declineChoice: rebuildOrder.declineChoice,
			quoteStatus: sql<string | null>`(select q.status from quote q where q.order_id = ${rebuildOrder.id} order by q.id desc limit 1)`
		})
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.leftJoin(rebuildOrder, eq(rebuildOrder.unitId, unit.id))
		.where(and(eq(unit.held, false), inArray(unit.state, ['packed', 'inspected', 'accepted'])))
		.orderBy(asc(unit.stateSince))
		.all();
	return rows
		.filter((r) => r.state === 'packed' || (r.declineChoice === 'return' && r.quoteStatus === 'declined'))
		.map(({ customerName, ...r }) => ({ ...r, customerName: customers ? customerName : null, unrepaired: r.state !== 'packed' }));
}

/**
 * Where a shipment went, as the role may see it. A depot's name and address are the shop's own;
 * a customer's or a web buyer's name and address only for roles that may see customers — the
 * others read the order or web-order number instead.
 */
export function shipToFor(role: Role, s: { destination: (typeof shipment.$inferSelect)['destination']; shipTo: string; reference: string; orderCode: string | null }): string {
	if (s.destination === 'distributor' || maySee(role, 'customer')) return s.shipTo;
	return s.destination === 'customer' ? `Customer order ${s.orderCode ?? ''}`.trim() : `Web order ${s.reference}`.trim();
}

function nextCode(tx: DbOrTx, now: Date): string {
	const n = (tx.select({ n: sql<number>`count(*)` }).from(shipment).get()?.n ?? 0) + 1;
	return `SH-${now.toISOString().slice(2, 10).replaceAll('-', '')}-${String(n).padStart(3, '0')}`;
}

export function createShipment(db: Db, actor: Actor, input: NewShipment, now: Date = new Date()): { id: number; code: string } {
	if (!STEERING_ROLES.includes(actor.role)) throw new ShipmentError(`A ${actor.role} cannot send shipments; ask the lead.`);
	const serials = [...new Set(input.serials)];
	return db.transaction(
		() => {
			let shipTo = input.shipTo;
			let locationId: number | null = null;
			let orderId: number | null = null;
			if (input.destination === 'distributor') {
				const loc = db.select().from(shipLocation).where(eq(shipLocation.id, input.locationId!)).get();
				if (!loc || !loc.active) throw new ShipmentError('No such depot.');
				locationId = loc.id;
				shipTo = `${loc.name}\n${loc.address}`.trim();
			} else if (input.destination === 'customer') {
				const order = db.select().from(rebuildOrder).where(eq(rebuildOrder.id, input.orderId!)).get();
				if (!order) throw new ShipmentError('No such customer order.');
				orderId = order.id;
				shipTo = `${order.customerName}\n${order.shipAddress}`;
			}
			const units = db.select({ id: unit.id, serial: unit.serial, state: unit.state }).from(unit).where(inArray(unit.serial, serials)).all();
			const missing = serials.filter((s) => !units.some((u) => u.serial === s));
			if (missing.length) throw new ShipmentError(`No unit ${missing.join(', ')} in the shop.`);
			for (const u of units) {
				const onShipment = db
					.select({ code: shipment.code })
					.from(shipmentUnit)
					.innerJoin(shipment, eq(shipment.id, shipmentUnit.shipmentId))
					.where(eq(shipmentUnit.unitId, u.id))
					.get();
				if (onShipment) throw new ShipmentError(`${u.serial} already went out on shipment ${onShipment.code}.`);
				const owner = db.select({ id: rebuildOrder.id }).from(rebuildOrder).where(eq(rebuildOrder.unitId, u.id)).get();
				if (owner && input.destination !== 'customer') throw new ShipmentError(`${u.serial} is a customer's unit; it ships to its customer.`);
				if (owner && orderId !== null && owner.id !== orderId) throw new ShipmentError(`${u.serial} belongs to another customer's order.`);
				if (input.destination === 'customer' && !owner) throw new ShipmentError(`${u.serial} is shop stock, not this customer's unit.`);
			}
			const code = nextCode(db, now);
			const s = db
				.insert(shipment)
				.values({
					code,
					destination: input.destination,
					locationId,
					orderId,
					reference: input.reference,
					shipTo,
					carrier: input.carrier,
					trackingNumber: input.trackingNumber,
					createdBy: actor.id,
					createdAt: now
				})
				.returning({ id: shipment.id })
				.get();
			for (const u of units) {
				db.insert(shipmentUnit).values({ shipmentId: s.id, unitId: u.id }).run();
				const r = applyMove(db, actor, {
					serial: u.serial,
					action: u.state === 'packed' ? 'ship' : 'return',
					idempotencyKey: `shipment:${code}:${u.serial}:${randomUUID()}`
				}, now);
				if (!r.ok) throw new ShipmentError(r.message);
			}
			return { id: s.id, code };
		},
		{ behavior: 'immediate' }
	);
}

export function listShipments(db: DbOrTx, role: Role) {
	return db
		.select({
			id: shipment.id,
			code: shipment.code,
			destination: shipment.destination,
			shipTo: shipment.shipTo,
			reference: shipment.reference,
			orderCode: rebuildOrder.code,
			carrier: shipment.carrier,
			trackingNumber: shipment.trackingNumber,
			createdAt: shipment.createdAt,
			units: sql<number>`(select count(*) from shipment_unit su where su.shipment_id = ${shipment.id})`
		})
		.from(shipment)
		.leftJoin(rebuildOrder, eq(rebuildOrder.id, shipment.orderId))
		.orderBy(desc(shipment.id))
		.limit(200)
		.all()
		.map((r) => ({ ...r, shipTo: shipToFor(role, r), createdAt: r.createdAt.toISOString() }));
}

/** One shipment with its units; the ship-to as `shipToFor` gives it to the role. */
export function shipmentDetail(db: DbOrTx, id: number, role: Role) {
	const s = db.select().from(shipment).where(eq(shipment.id, id)).get();
	if (!s) return null;
	const units = db
		.select({ serial: unit.serial, modelCode: turboModel.code, modelDescription: turboModel.description, originalTag: unit.originalTag, state: unit.state })
		.from(shipmentUnit)
		.innerJoin(unit, eq(unit.id, shipmentUnit.unitId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(shipmentUnit.shipmentId, id))
		.orderBy(asc(unit.serial))
		.all();
	const unrepaired = new Set(
		db
			.select({ serial: unit.serial })
			.from(unitEvent)
			.innerJoin(unit, eq(unit.id, unitEvent.unitId))
			.innerJoin(shipmentUnit, eq(shipmentUnit.unitId, unit.id))
			.where(and(eq(shipmentUnit.shipmentId, id), eq(unitEvent.action, 'return')))
			.all()
			.map((r) => r.serial)
	);
	const order = s.orderId ? db.select({ code: rebuildOrder.code }).from(rebuildOrder).where(eq(rebuildOrder.id, s.orderId)).get() : null;
	const shown = { ...s, shipTo: shipToFor(role, { ...s, orderCode: order?.code ?? null }) };
	return { shipment: { ...shown, createdAt: s.createdAt.toISOString() }, units: units.map((u) => ({ ...u, unrepaired: unrepaired.has(u.serial) })), orderCode: order?.code ?? null };
}

export function shipLocations(db: DbOrTx) {
	return db.select().from(shipLocation).where(eq(shipLocation.active, true)).orderBy(asc(shipLocation.name)).all();
}

/** Finished units shipped to each distributor location, by model. */
export function stockByLocation(db: DbOrTx) {
	return db
		.select({ location: shipLocation.name, modelCode: turboModel.code, units: sql<number>`count(*)` })
		.from(shipment)
		.innerJoin(shipLocation, eq(shipLocation.id, shipment.locationId))
		.innerJoin(shipmentUnit, eq(shipmentUnit.shipmentId, shipment.id))
		.innerJoin(unit, eq(unit.id, shipmentUnit.unitId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.groupBy(shipLocation.name, turboModel.code)
		.orderBy(asc(shipLocation.name), asc(turboModel.code))
		.all();
}

/** Customer orders that may receive a shipment (not yet shipped); the customer's name only for roles that may see customers. */
export function openCustomerOrders(db: DbOrTx, role: Role) {
	const customers = maySee(role, 'customer');
	return db
		.select({ id: rebuildOrder.id, code: rebuildOrder.code, customerName: rebuildOrder.customerName })
		.from(rebuildOrder)
		.innerJoin(unit, eq(unit.id, rebuildOrder.unitId))
		.leftJoin(shipmentUnit, eq(shipmentUnit.unitId, unit.id))
		.where(and(isNull(shipmentUnit.unitId), inArray(unit.state, ['packed', 'inspected', 'accepted'])))
		.orderBy(asc(rebuildOrder.code))
		.all()
		.map((o) => ({ ...o, customerName: customers ? o.customerName : null }));
}

