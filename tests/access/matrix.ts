/**
 * What every person should get from every route: THE place to add a route's expectations.
 *
 * One entry per route id in `src/routes`, keyed exactly as `ROUTE_ACCESS` is. Each entry says
 * how to build a real path from the fixtures and lists checks: a method (and form action) with
 * the answer each kind of visitor must get. `tests/server/access-matrix.test.ts` runs every
 * check against the built server with real sign-ins, and fails when a route, an exported
 * method or a form action has no check here.
 *
 * Visitors: the four roles signed in, `anon` (no session) and `customer` (no session, but
 * holding a valid customer tracking token: `path(f, 'customer')` may put `f.token` in the
 * path; everywhere else a customer is just a visitor without a session).
 */
import type { Role } from '../../src/lib/domain/auth/roles';

export type Who = Role | 'anon' | 'customer';
export const VISITORS: readonly Who[] = ['owner', 'lead', 'tech', 'office', 'anon', 'customer'];

/**
 * ok        200
 * pass      got through the access check: not 401/403, not sent to sign in, not 5xx
 *           (mutations are sent with an empty body, so a 400 from validation is a pass)
 * redirect  3xx somewhere other than the sign-in page
 * login     pages: 303 to /login?next=…; API calls and page posts: 401
 * forbidden 403
 * missing   404
 */
export type Answer = 'ok' | 'pass' | 'redirect' | 'login' | 'forbidden' | 'missing';

export interface Fixtures {
	/** A unit that exists, a station code that exists. */
	serial: string;
	stationCode: string;
	/** A lot and a model that exist. */
	lotCode: string;
	modelCode: string;
	/** A live customer tracking token, and a photo shared on that token's order. */
	token: string;
	sharedPhotoId: number;
}

/** The customer's own status link; every other visitor tries a made-up token. */
const trackPath = (tail: string) => (f: Fixtures, who: Who) => `/track/${who === 'customer' ? f.token : 'not-a-valid-token-at-all'}${tail}`;

export interface Check {
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	/** A form action name (`default` for the unnamed one); posted as a browser without script posts it. */
	action?: string;
	/** Body for API mutations (JSON); forms are sent empty. Defaults to `{}`. */
	json?: unknown;
	/** A streaming answer: read only the status and headers. */
	stream?: boolean;
	/** The request ends the session (sign out): use a session of its own. */
	endsSession?: boolean;
	answers: Record<Who, Answer>;
}

export interface RouteExpectation {
	path(f: Fixtures, who: Who): string;
	checks: Check[];
}

const ROLES_ONLY: readonly Role[] = ['owner', 'lead', 'tech', 'office'];

/** Signed-in people in `allowed` get `yes`, other roles 403, visitors without a session are sent to sign in. */
export function only(allowed: readonly Role[], yes: Answer = 'ok'): Record<Who, Answer> {
	const out = { anon: 'login', customer: 'login' } as Record<Who, Answer>;
	for (const r of ROLES_ONLY) out[r] = allowed.includes(r) ? yes : 'forbidden';
	return out;
}

/** Everyone, signed in or not, gets the same answer. */
export function everyone(answer: Answer): Record<Who, Answer> {
	return Object.fromEntries(VISITORS.map((w) => [w, answer])) as Record<Who, Answer>;
}

const ALL = ROLES_ONLY;
const FLOOR: readonly Role[] = ['owner', 'lead', 'tech'];
const OWNER: readonly Role[] = ['owner'];
const INTAKE: readonly Role[] = ['office', 'lead', 'owner'];
const STEERING: readonly Role[] = ['lead', 'owner'];
const forms = (roles: readonly Role[], ...names: string[]): Check[] =>
	names.map((action) => ({ method: 'POST', action, answers: only(roles, 'pass') }));

export const EXPECTED: Record<string, RouteExpectation> = {
	'/login': {
		path: () => '/login',
		checks: [
			// signed-in people are sent on to their home page
			{ method: 'GET', answers: { ...only(ALL, 'redirect'), anon: 'ok', customer: 'ok' } },
			{ method: 'POST', action: 'default', answers: everyone('pass') }
		]
	},
	'/logout': {
		path: () => '/logout',
		checks: [{ method: 'POST', endsSession: true, answers: only(ALL, 'redirect') }]
	},
	'/api/health': { path: () => '/api/health', checks: [{ method: 'GET', answers: everyone('ok') }] },

	'/(app)': { path: () => '/', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/units': { path: () => '/units', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/units/[serial=serial]': { path: (f) => `/units/${f.serial}`, checks: [{ method: 'GET', answers: only(ALL) }] },
	// a tech with one home station is sent straight to it
	'/(app)/stations': { path: () => '/stations', checks: [{ method: 'GET', answers: { ...only(ALL), tech: 'redirect' } }] },
	'/(app)/stations/[code=code]': {
		path: (f) => `/stations/${f.stationCode}`,
		checks: [
			{ method: 'GET', answers: only(ALL) },
			{ method: 'POST', action: 'scan', answers: only(FLOOR, 'pass') },
			{ method: 'POST', action: 'move', answers: only(FLOOR, 'pass') }
		]
	},
	'/(app)/admin/users': {
		path: () => '/admin/users',
		checks: [
			{ method: 'GET', answers: only(OWNER) },
			{ method: 'POST', action: 'create', answers: only(OWNER, 'pass') },
			{ method: 'POST', action: 'role', answers: only(OWNER, 'pass') },
			{ method: 'POST', action: 'active', answers: only(OWNER, 'pass') },
			{ method: 'POST', action: 'lift', answers: only(OWNER, 'pass') }
		]
	},

	'/api/units': { path: () => '/api/units', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/api/units/[serial=serial]': { path: (f) => `/api/units/${f.serial}`, checks: [{ method: 'GET', answers: only(ALL) }] },
	'/api/units/[serial=serial]/events': {
		path: (f) => `/api/units/${f.serial}/events`,
		checks: [{ method: 'POST', json: {}, answers: only(FLOOR, 'pass') }]
	},
	'/api/stations': { path: () => '/api/stations', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/api/stream': { path: () => '/api/stream', checks: [{ method: 'GET', stream: true, answers: only(ALL) }] },

	// Balancing, assembly and model specs
	'/(app)/models': { path: () => '/models', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/models/[code=code]': {
		path: (f) => `/models/${f.modelCode}`,
		checks: [{ method: 'GET', answers: only(ALL) }, ...forms(OWNER, 'save')]
	},
	'/(app)/units/[serial=serial]/balance': {
		path: (f) => `/units/${f.serial}/balance`,
		checks: [{ method: 'GET', answers: only(ALL) }, ...forms(FLOOR, 'record', 'balanced')]
	},
	'/(app)/units/[serial=serial]/assembly': {
		path: (f) => `/units/${f.serial}/assembly`,
		checks: [{ method: 'GET', answers: only(ALL) }, ...forms(FLOOR, 'record', 'assembled')]
	},
	'/api/units/[serial=serial]/balance-runs': {
		path: (f) => `/api/units/${f.serial}/balance-runs`,
		checks: [
			{ method: 'GET', answers: only(ALL) },
			{ method: 'POST', json: {}, answers: only(FLOOR, 'pass') }
		]
	},
	'/api/units/[serial=serial]/assembly': {
		path: (f) => `/api/units/${f.serial}/assembly`,
		checks: [
			{ method: 'GET', answers: only(ALL) },
			{ method: 'POST', json: {}, answers: only(FLOOR, 'pass') }
		]
	},

	// Customers' units, quotes, shipments, the status link, payments, the test mailbox
	'/(app)/orders': { path: () => '/orders', checks: [{ method: 'GET', answers: only(INTAKE) }, ...forms(INTAKE, 'create'), ...forms(OWNER, 'settings')] },
	'/(app)/orders/[id=id]': {
		path: () => '/orders/999999',
		checks: [
			{ method: 'GET', answers: only(INTAKE, 'missing') },
			...forms(INTAKE, 'addLine', 'removeLine', 'setCore', 'sendQuote', 'withdrawQuote', 'sharePhoto', 'resendLink', 'revokeLink', 'scrapDeclined')
		]
	},
	'/(app)/shipments': { path: () => '/shipments', checks: [{ method: 'GET', answers: only(ALL) }, ...forms(STEERING, 'create')] },
	'/(app)/shipments/[id=id]': { path: () => '/shipments/999999', checks: [{ method: 'GET', answers: only(ALL, 'missing') }] },
	'/(app)/shipments/[id=id]/slip': { path: () => '/shipments/999999/slip', checks: [{ method: 'GET', answers: only(ALL, 'missing') }] },
	'/(app)/dev/mail': { path: () => '/dev/mail', checks: [{ method: 'GET', answers: only(OWNER, 'pass') }] },
	'/api/dev/mail/[id=id]': { path: () => '/api/dev/mail/999999', checks: [{ method: 'GET', answers: only(OWNER, 'missing') }] },
	'/track/[token]': {
		path: trackPath(''),
		checks: [
			{ method: 'GET', answers: { ...everyone('missing'), customer: 'ok' } },
			...['approve', 'decline', 'pay', 'prefs'].map((action): Check => ({ method: 'POST', action, answers: everyone('pass') }))
		]
	},
	'/track/[token]/photos/[id=id]': {
		// the customer's own token with a photo shared on their order; everyone else guesses
		path: (f, who) => trackPath(`/photos/${who === 'customer' && f.sharedPhotoId ? f.sharedPhotoId : 999999}`)(f, who),
		checks: [{ method: 'GET', answers: { ...everyone('missing'), customer: 'ok' } }]
	},
	'/api/payments/webhook': { path: () => '/api/payments/webhook', checks: [{ method: 'POST', json: {}, answers: everyone('pass') }] },

	// Lot intake, travelers and printed histories
	'/(app)/lots': { path: () => '/lots', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/lots.csv': { path: () => '/lots.csv', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/lots/new': { path: () => '/lots/new', checks: [{ method: 'GET', answers: only(INTAKE) }, ...forms(INTAKE, 'default')] },
	'/(app)/lots/[code=code]': { path: (f) => `/lots/${f.lotCode}`, checks: [{ method: 'GET', answers: only(ALL) }, ...forms(INTAKE, 'add')] },
	'/(app)/lots/[code=code]/import': {
		path: (f) => `/lots/${f.lotCode}/import`,
		checks: [{ method: 'GET', answers: only(INTAKE) }, ...forms(INTAKE, 'preview', 'import')]
	},
	'/(app)/suppliers': { path: () => '/suppliers', checks: [{ method: 'GET', answers: only(ALL) }, ...forms(['owner', 'office'], 'create', 'update')] },
	'/(print)/lots/[code=code]/travelers': { path: (f) => `/lots/${f.lotCode}/travelers`, checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(print)/units/[serial=serial]/traveler': { path: (f) => `/units/${f.serial}/traveler`, checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(print)/units/[serial=serial]/print': { path: (f) => `/units/${f.serial}/print`, checks: [{ method: 'GET', answers: only(ALL) }] },
	'/api/units/[serial=serial]/barcode': { path: (f) => `/api/units/${f.serial}/barcode`, checks: [{ method: 'GET', answers: only(ALL) }] },

	// Floor boards, TV mode, the owner's floor setup, undo, qualification and photos
	'/tv': { path: (f) => `/tv?stations=${f.stationCode}`, checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/admin/floor': { path: () => '/admin/floor', checks: [{ method: 'GET', answers: only(OWNER) }, ...forms(OWNER, 'assign', 'overdue')] },
	'/(app)/admin/scrap-reasons': {
		path: () => '/admin/scrap-reasons',
		checks: [{ method: 'GET', answers: only(OWNER) }, ...forms(OWNER, 'add', 'rename', 'toggle')]
	},
	'/(app)/admin/checklists': {
		path: () => '/admin/checklists',
		checks: [{ method: 'GET', answers: only(OWNER) }, ...forms(OWNER, 'create', 'addItem', 'toggleItem')]
	},
	'/api/stations/[code=code]/board': { path: (f) => `/api/stations/${f.stationCode}/board`, checks: [{ method: 'GET', answers: only(ALL) }] },
	'/api/units/[serial=serial]/undo': {
		path: (f) => `/api/units/${f.serial}/undo`,
		checks: [{ method: 'POST', json: {}, answers: only(FLOOR, 'pass') }]
	},
	'/api/units/[serial=serial]/inspection': {
		path: (f) => `/api/units/${f.serial}/inspection`,
		checks: [
			{ method: 'GET', answers: only(ALL) },
			{ method: 'POST', json: {}, answers: only(FLOOR, 'pass') }
		]
	},
	'/api/photos/[sha=sha256]': { path: () => `/api/photos/${'0'.repeat(64)}`, checks: [{ method: 'GET', answers: only(ALL, 'missing') }] },

	// The lead's board: cards, demand, stock and the build plan
	'/(app)/cards': {
		path: () => '/cards',
		checks: [{ method: 'GET', answers: only(ALL) }, ...forms(STEERING, 'create', 'update', 'close', 'reopen', 'move')]
	},
	'/api/cards': { path: () => '/api/cards', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/api/cards/order': { path: () => '/api/cards/order', checks: [{ method: 'PUT', json: {}, answers: only(STEERING, 'pass') }] },
	'/(app)/demand': { path: () => '/demand', checks: [{ method: 'GET', answers: only(ALL) }, ...forms(INTAKE, 'create', 'status')] },
	'/(app)/demand/import': {
		path: () => '/demand/import',
		checks: [{ method: 'GET', answers: only(INTAKE) }, ...forms(INTAKE, 'preview', 'import')]
	},
	'/(app)/stock': { path: () => '/stock', checks: [{ method: 'GET', answers: only(ALL) }] },
	'/(app)/plan': {
		path: () => '/plan',
		checks: [
			{ method: 'GET', answers: only(STEERING) },
			// only the owner sets the smoothing constant
			...forms(OWNER, 'alpha'),
			...forms(STEERING, 'card')
		]
	},

	// The owner's reports (the lead sees flow)
	'/(app)/reports': { path: () => '/reports', checks: [{ method: 'GET', answers: only(STEERING) }] },
	'/(app)/reports/scrap': { path: () => '/reports/scrap', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/(app)/reports/scrap/lots/[code=code]': { path: (f) => `/reports/scrap/lots/${f.lotCode}`, checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/(app)/reports/suppliers': { path: () => '/reports/suppliers', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/(app)/reports/flow': { path: () => '/reports/flow', checks: [{ method: 'GET', answers: only(STEERING) }] },
	'/(app)/reports/warranty': { path: () => '/reports/warranty', checks: [{ method: 'GET', answers: only(OWNER) }, ...forms(OWNER, 'link')] },
	'/(app)/reports/warranty/[serial=serial]': {
		path: (f) => `/reports/warranty/${f.serial}`,
		checks: [{ method: 'GET', answers: only(OWNER) }, ...forms(OWNER, 'verdict')]
	},
	'/(app)/reports/settings': { path: () => '/reports/settings', checks: [{ method: 'GET', answers: only(OWNER) }, ...forms(OWNER, 'default')] },
	'/api/reports/scrap': { path: () => '/api/reports/scrap', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/scrap/lots/[code=code]': { path: (f) => `/api/reports/scrap/lots/${f.lotCode}`, checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/suppliers': { path: () => '/api/reports/suppliers', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/flow': { path: () => '/api/reports/flow', checks: [{ method: 'GET', answers: only(STEERING) }] },
	'/api/reports/warranty': { path: () => '/api/reports/warranty', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/warranty/parts-lots': { path: () => '/api/reports/warranty/parts-lots', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/warranty/[serial=serial]': { path: (f) => `/api/reports/warranty/${f.serial}`, checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/(app)/reports/balance': { path: () => '/reports/balance', checks: [{ method: 'GET', answers: only(STEERING) }] },
	'/api/reports/balance': { path: () => '/api/reports/balance', checks: [{ method: 'GET', answers: only(STEERING) }] },
	'/api/reports/buying/compare': { path: () => '/api/reports/buying/compare?kind=source&a=purchased_skid&b=customer_return', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/buying/cost': { path: () => '/api/reports/buying/cost', checks: [{ method: 'GET', answers: only(OWNER) }] },
	'/api/reports/buying/skid': { path: () => '/api/reports/buying/skid?supplier=1&cores=40&price=30.00', checks: [{ method: 'GET', answers: only(OWNER) }] }
};
