/**
 * Who may reach which route. Every route in `src/routes` has an entry, keyed by its route
 * id; a route without one is refused for everybody. Pages are checked on every request
 * (load and form actions alike); API routes per HTTP method.
 */
import type { Role } from '../domain/auth/roles';
import { ALL_ROLES, FLOOR_ROLES, INTAKE_ROLES, STEERING_ROLES } from '../domain/auth/roles';

export type Audience = readonly Role[] | 'public';
type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RouteRule {
	/** Who may load the page or call GET. */
	read: Audience;
	/** Who may post form actions or call mutating methods; defaults to `read`. */
	write?: Audience;
	/** Per-method rules for API routes, overriding read/write. */
	methods?: Partial<Record<Method, Audience>>;
}

const OWNER: readonly Role[] = ['owner'];
const OWNER_AND_LEAD: readonly Role[] = ['owner', 'lead'];

export const ROUTE_ACCESS: Record<string, RouteRule> = {
	'/login': { read: 'public' },
	'/logout': { read: ALL_ROLES },
	'/api/health': { read: 'public' },

	'/(app)': { read: ALL_ROLES },
	'/(app)/units': { read: ALL_ROLES },
	'/(app)/units/[serial=serial]': { read: ALL_ROLES, write: FLOOR_ROLES },
	'/(app)/stations': { read: ALL_ROLES },
	'/(app)/stations/[code=code]': { read: ALL_ROLES, write: FLOOR_ROLES },
	'/(app)/admin/users': { read: OWNER },
	'/(app)/models': { read: ALL_ROLES },
	'/(app)/models/[code=code]': { read: ALL_ROLES, write: OWNER },
	'/(app)/units/[serial=serial]/balance': { read: ALL_ROLES, write: FLOOR_ROLES },
	'/(app)/units/[serial=serial]/assembly': { read: ALL_ROLES, write: FLOOR_ROLES },

	'/api/units': { read: ALL_ROLES },
	'/api/units/[serial=serial]': { read: ALL_ROLES },
	'/api/units/[serial=serial]/events': { read: ALL_ROLES, methods: { POST: FLOOR_ROLES } },
	'/api/stations': { read: ALL_ROLES },
	'/api/units/[serial=serial]/balance-runs': { read: ALL_ROLES, methods: { POST: FLOOR_ROLES } },
	'/api/units/[serial=serial]/assembly': { read: ALL_ROLES, methods: { POST: FLOOR_ROLES } },
	'/api/stream': { read: ALL_ROLES },

	// Customers' own units: orders, shipments, the status link, payments, the test mailbox.
	'/(app)/orders': { read: INTAKE_ROLES },
	'/(app)/orders/[id=id]': { read: INTAKE_ROLES },
	'/(app)/shipments': { read: ALL_ROLES, write: STEERING_ROLES },
	'/(app)/shipments/[id=id]': { read: ALL_ROLES },
	'/(app)/shipments/[id=id]/slip': { read: ALL_ROLES },
	'/(app)/dev/mail': { read: OWNER },
	'/api/dev/mail/[id=id]': { read: OWNER },
	'/track/[token]': { read: 'public' },
	'/track/[token]/photos/[id=id]': { read: 'public' },
	'/api/payments/webhook': { read: 'public', methods: { POST: 'public' } },

	// Lot intake, travelers and printed histories
	'/(app)/lots': { read: ALL_ROLES },
	'/(app)/lots.csv': { read: ALL_ROLES },
	'/(app)/lots/new': { read: INTAKE_ROLES },
	'/(app)/lots/[code=code]': { read: ALL_ROLES, write: INTAKE_ROLES },
	'/(app)/lots/[code=code]/import': { read: INTAKE_ROLES },
	'/(app)/suppliers': { read: ALL_ROLES, write: ['owner', 'office'] },
	'/(print)/lots/[code=code]/travelers': { read: ALL_ROLES },
	'/(print)/units/[serial=serial]/traveler': { read: ALL_ROLES },
	'/(print)/units/[serial=serial]/print': { read: ALL_ROLES },
	'/api/units/[serial=serial]/barcode': { read: ALL_ROLES },

	// The lead's board: cards order the floor; orders, stock and the build plan.
	'/(app)/cards': { read: ALL_ROLES, write: STEERING_ROLES },
	'/api/cards': { read: ALL_ROLES },
	'/api/cards/order': { read: ALL_ROLES, methods: { PUT: STEERING_ROLES } },
	'/(app)/demand': { read: ALL_ROLES, write: INTAKE_ROLES },
	'/(app)/demand/import': { read: INTAKE_ROLES, write: INTAKE_ROLES },
	'/(app)/stock': { read: ALL_ROLES },
	'/(app)/plan': { read: STEERING_ROLES, write: STEERING_ROLES },

	// floor boards
	'/tv': { read: ALL_ROLES },
	'/(app)/admin/floor': { read: OWNER },
	'/(app)/admin/scrap-reasons': { read: OWNER },
	'/(app)/admin/checklists': { read: OWNER },
	'/api/stations/[code=code]/board': { read: ALL_ROLES },
	'/api/units/[serial=serial]/undo': { read: FLOOR_ROLES, methods: { POST: FLOOR_ROLES } },
	'/api/units/[serial=serial]/inspection': { read: ALL_ROLES, methods: { POST: FLOOR_ROLES } },
	'/api/photos/[sha=sha256]': { read: ALL_ROLES },

	// Owner's reports (flow is shared with the lead, who steers the floor)
	'/(app)/reports': { read: OWNER_AND_LEAD },
	'/(app)/reports/scrap': { read: OWNER },
	'/(app)/reports/scrap/lots/[code=code]': { read: OWNER },
	'/(app)/reports/suppliers': { read: OWNER },
	'/(app)/reports/flow': { read: OWNER_AND_LEAD },
	'/(app)/reports/warranty': { read: OWNER },
	'/(app)/reports/warranty/[serial=serial]': { read: OWNER },
	'/(app)/reports/settings': { read: OWNER },
	'/api/reports/scrap': { read: OWNER },
	'/api/reports/scrap/lots/[code=code]': { read: OWNER },
	'/api/reports/suppliers': { read: OWNER },
	'/api/reports/flow': { read: OWNER_AND_LEAD },
	'/api/reports/warranty': { read: OWNER },
	'/api/reports/warranty/parts-lots': { read: OWNER },
	'/api/reports/warranty/[serial=serial]': { read: OWNER },

	// Decisions: which cores to buy (owner); whether the balancer drifts (owner and lead)
	'/(app)/reports/balance': { read: OWNER_AND_LEAD },
	'/api/reports/balance': { read: OWNER_AND_LEAD },
	'/api/reports/buying/compare': { read: OWNER },
	'/api/reports/buying/cost': { read: OWNER },
	'/api/reports/buying/skid': { read: OWNER }

};

/**
 * Who may see which fields, wherever they appear (pages, their `__data.json`, JSON and CSV).
 * A route that lets a role in still leaves these out of what it sends to a role not listed:
 * the services and loads ask `maySee` and drop the field, they do not just hide it in the page.
 *
 * - customer:  a customer's name, e-mail, phone and postal address (rebuild orders, the customer
 *              on a demand order, the ship-to of customer and web-order shipments, packing slips).
 *              The people who take customers' units in and send them back: office, lead, owner.
 * - lotCost:   the price paid per core, typed in at intake (office, lead, owner).
 * - quoteMoney: quote lines, totals and payments (office, lead, owner: who write the quotes).
 * - lotYield:  per-lot counts of shipped and scrapped units, the raw data behind the owner's
 *              scrap and supplier reports (owner).
 * The floor (tech) works with serials, models, lots and states: none of the above.
 */
export const FIELD_ACCESS = {
	customer: INTAKE_ROLES,
	lotCost: INTAKE_ROLES,
	quoteMoney: INTAKE_ROLES,
	lotYield: OWNER
} as const satisfies Record<string, readonly Role[]>;

export type Field = keyof typeof FIELD_ACCESS;
export const FIELDS = Object.keys(FIELD_ACCESS) as Field[];

export function maySee(role: Role, field: Field): boolean {
	return (FIELD_ACCESS[field] as readonly Role[]).includes(role);
}

/** Every field rule for one role, e.g. to tell a page which columns it was sent. */
export function fieldsFor(role: Role): Record<Field, boolean> {
	return Object.fromEntries(FIELDS.map((f) => [f, maySee(role, f)])) as Record<Field, boolean>;
}

const READ_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export type AccessVerdict = 'allow' | 'sign-in' | 'forbidden' | 'unlisted';

export function checkAccess(routeId: string, method: string, role: Role | null): AccessVerdict {
	const rule = ROUTE_ACCESS[routeId];
	if (!rule) return 'unlisted';
	const m = method.toUpperCase() as Method;
	const audience: Audience =
		rule.methods?.[m] ?? (READ_METHODS.has(m) ? rule.read : (rule.write ?? rule.read));
	if (audience === 'public') return 'allow';
	if (!role) return 'sign-in';
	return audience.includes(role) ? 'allow' : 'forbidden';
}

/** Where each role lands after signing in. */
export function homeFor(role: Role): string {
	switch (role) {
		case 'tech':
			return '/stations';
		default:
			return '/';
	}
}
