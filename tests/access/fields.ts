/**
 * Who sees which fields: THE place to add a page, API or export that carries customer data,
 * prices, costs or per-lot yields. `tests/server/access-matrix.test.ts` fetches each one as each
 * role from the built server and searches the body for known values of the fixtures: a field
 * listed under `carries` must be in the body exactly when `FIELD_ACCESS` (src/lib/server/access.ts)
 * lets the role see it; a field under `never` must not be in the body for anybody.
 *
 * Pages are fetched twice: the HTML (which embeds the load's data) and `__data.json` (the load's
 * data as client navigation gets it), so a field hidden only in the markup still fails.
 */
import type { Field } from '../../src/lib/server/access';

export interface FieldFixtures {
	lotCode: string;
	/** The fixture lot's price per core, in cents (a value found nowhere else). */
	lotCostCents: number;
	/** A customer order with a sent quote: its id, the customer's name and e-mail, a quote line's unit price in cents. */
	orderId: number;
	customerName: string;
	customerEmail: string;
	quotePriceCents: number;
	/** A shipment to that customer and one to a web buyer, with a line of each address. */
	customerShipmentId: number;
	customerShipTo: string;
	webShipmentId: number;
	webBuyer: string;
	/** The unit of the customer order. */
	customerSerial: string;
	/** The customer on an open walk-in demand order. */
	walkInCustomer: string;
}

export type BodyKind = 'page' | 'json' | 'csv' | 'pdf';

export interface FieldCheck {
	name: string;
	path(f: FieldFixtures): string;
	kind: BodyKind;
	carries: Partial<Record<Field, (f: FieldFixtures, kind: 'html' | 'data' | 'json' | 'csv' | 'pdf') => string[]>>;
	never?: Partial<Record<Field, (f: FieldFixtures, kind: 'html' | 'data' | 'json' | 'csv' | 'pdf') => string[]>>;
}

const money = (cents: number) => (cents / 100).toFixed(2);
/** A price as the load sends it (cents) or as a CSV or a page shows it (currency units). */
const lotCost = (f: FieldFixtures, kind: string) => [kind === 'csv' ? money(f.lotCostCents) : String(f.lotCostCents)];
/** The per-lot shipped and scrapped counts, found by their names in the data or the CSV header. */
const lotYield = (_f: FieldFixtures, kind: string) =>
	kind === 'csv' ? [',shipped,scrapped,'] : kind === 'html' ? ['scrapped:', 'shipped:'] : ['"scrapped":', '"shipped":'];
const customer = (f: FieldFixtures) => [f.customerName, f.customerEmail];
const customerName = (f: FieldFixtures) => [f.customerName];

export const FIELD_CHECKS: FieldCheck[] = [
	{ name: 'lot list', path: () => '/lots', kind: 'page', carries: { lotCost, lotYield }, never: { customer } },
	{ name: 'lot list CSV', path: () => '/lots.csv', kind: 'csv', carries: { lotCost, lotYield }, never: { customer } },
	{ name: 'lot page', path: (f) => `/lots/${f.lotCode}`, kind: 'page', carries: { lotCost, lotYield } },
	{ name: 'lot travelers', path: (f) => `/lots/${f.lotCode}/travelers`, kind: 'page', carries: {}, never: { lotCost, lotYield } },
	{ name: 'suppliers', path: () => '/suppliers', kind: 'page', carries: {}, never: { lotCost, lotYield } },
	{
		name: 'shipments list',
		path: () => '/shipments',
		kind: 'page',
		carries: { customer: (f) => [f.customerShipTo, f.webBuyer] },
		never: { customer: (f) => [f.customerEmail], lotCost, quoteMoney: (f) => [String(f.quotePriceCents)] }
	},
	{ name: 'shipment to a customer', path: (f) => `/shipments/${f.customerShipmentId}`, kind: 'page', carries: { customer: (f) => [f.customerShipTo] }, never: { customer: (f) => [f.customerEmail] } },
	{ name: 'shipment to a web buyer', path: (f) => `/shipments/${f.webShipmentId}`, kind: 'page', carries: { customer: (f) => [f.webBuyer] } },
	{ name: 'packing slip to a customer', path: (f) => `/shipments/${f.customerShipmentId}/slip`, kind: 'pdf', carries: { customer: (f) => [f.customerShipTo] } },
	{ name: 'packing slip to a web buyer', path: (f) => `/shipments/${f.webShipmentId}/slip`, kind: 'pdf', carries: { customer: (f) => [f.webBuyer] } },
	{ name: 'demand orders', path: () => '/demand', kind: 'page', carries: { customer: (f) => [f.walkInCustomer] } },
	{ name: 'rebuild orders', path: () => '/orders', kind: 'page', carries: { customer: customerName } },
	{ name: 'one rebuild order', path: (f) => `/orders/${f.orderId}`, kind: 'page', carries: { customer, quoteMoney: (f) => [String(f.quotePriceCents)] } },
	{ name: 'unit page of a customer unit', path: (f) => `/units/${f.customerSerial}`, kind: 'page', carries: {}, never: { customer, quoteMoney: (f) => [String(f.quotePriceCents)], lotCost } },
	{ name: 'unit API of a customer unit', path: (f) => `/api/units/${f.customerSerial}`, kind: 'json', carries: {}, never: { customer, lotCost } },
	{ name: 'printed history of a customer unit', path: (f) => `/units/${f.customerSerial}/print`, kind: 'page', carries: {}, never: { customer, lotCost } },
	{ name: 'traveler of a customer unit', path: (f) => `/units/${f.customerSerial}/traveler`, kind: 'page', carries: {}, never: { customer, lotCost } },
	{ name: 'stock', path: () => '/stock', kind: 'page', carries: {}, never: { customer, lotCost } },
	{ name: 'units list', path: () => '/units', kind: 'page', carries: {}, never: { customer, lotCost } },
	{ name: 'home', path: () => '/', kind: 'page', carries: {}, never: { customer, lotCost } }
];
