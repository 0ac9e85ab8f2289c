/**
 * Every mutating API route and form action, with the hostile requests fast-check makes for it:
 * THE place to add a line when a route that changes data lands. `tests/server/fuzz.test.ts`
 * fails when a mutating route or action has neither a target here nor a reason in NOT_FUZZED.
 */
import fc from 'fast-check';
import { ACTIONS } from '../../src/lib/domain/units/actions';
import { ROLES } from '../../src/lib/domain/auth/roles';

export type Who = 'owner' | 'lead' | 'tech' | 'office' | 'anon';

export interface FuzzFixtures {
	origin: string;
	serials: string[];
	stationCodes: string[];
	scrapReasons: string[];
	/** A person the owner may change freely; and the owner's own id. */
	victimId: string;
	ownerId: string;
	emails: string[];
	lotCodes: string[];
	modelCodes: string[];
	orderIds: number[];
}

export interface FuzzRequest {
	path: string;
	/** 'form' posts as an enhanced form (JSON answer); 'raw' sends body and content-type as given. */
	kind: 'form' | 'raw';
	/** For raw requests: the method (POST when not given). */
	method?: string;
	fields?: [string, string][];
	contentType?: string;
	body?: string;
	headers?: Record<string, string>;
}

export interface FuzzTarget {
	/** Route id, and the method or form action it exercises. */
	route: string;
	method?: string;
	action?: string;
	as: Who;
	request(f: FuzzFixtures): fc.Arbitrary<FuzzRequest>;
	/** Tables a rejected request may still write, on purpose (say why). */
	mayWrite?: string[];
	/** Most bodies are legitimately accepted (the action takes no input, or free text): skip the "mostly refused" check. */
	mostlyValid?: boolean;
	/** Share of the default run count (e.g. 0.5 for slow targets). */
	weight?: number;
}

// ---- hostile building blocks ----

const FRAGMENTS = [
	"' OR '1'='1",
	"'; DROP TABLE unit_event; --",
	'1; UPDATE unit SET state = \'shipped\'',
	'" UNION SELECT password_hash FROM user --',
	'<script>alert(1)</script>',
	'"><img src=x onerror=alert(1)>',
	'javascript:alert(1)',
	'../../../../etc/passwd',
	'..\\..\\windows\\win.ini',
	'%00',
	'\u0000',
	'${7*7}',
	'{{constructor.constructor("return 1")()}}',
	'__proto__',
	'constructor',
	'SY-00001\r\nSet-Cookie: x=1',
	'\u202eSY-00001',
	'ＳＹ－００００１',
	'🚀🔩',
	'NaN',
	'-1',
	'1e309',
	'null',
	'undefined',
	'true',
	'[]',
	'{}',
	' ',
	''
];

export const hostileString: fc.Arbitrary<string> = fc.oneof(
	{ weight: 3, arbitrary: fc.constantFrom(...FRAGMENTS) },
	{ weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
	{ weight: 2, arbitrary: fc.string({ unit: 'grapheme', maxLength: 40 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 20 }) },
	{ weight: 1, arbitrary: fc.constantFrom('x'.repeat(5000), 'é'.repeat(40_000), 'A'.repeat(70_000)) }
);

export const hostileNumber: fc.Arbitrary<number> = fc.oneof(
	fc.constantFrom(-1, 0, -0, 1.5, Number.MAX_SAFE_INTEGER, Number.MIN_SAFE_INTEGER, 2 ** 63, NaN, Infinity, -Infinity),
	fc.integer(),
	fc.double()
);

export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
	{ weight: 4, arbitrary: hostileString },
	{ weight: 2, arbitrary: hostileNumber },
	{ weight: 1, arbitrary: fc.boolean() },
	{ weight: 1, arbitrary: fc.constant(null) },
	{ weight: 1, arbitrary: fc.array(hostileString, { maxLength: 3 }) },
	{ weight: 1, arbitrary: fc.dictionary(hostileString, hostileString, { maxKeys: 3 }) }
);

/** A field that is usually present with a plausible or hostile value, sometimes missing. */
function field(plausible: fc.Arbitrary<string>): fc.Arbitrary<string | undefined> {
	return fc.oneof({ weight: 3, arbitrary: plausible }, { weight: 3, arbitrary: hostileString }, { weight: 1, arbitrary: fc.constant(undefined) });
}

/** Form fields from a record of optional values, plus now and then a duplicate or stray field. */
function formFields(rec: fc.Arbitrary<Record<string, string | undefined>>): fc.Arbitrary<[string, string][]> {
	return fc
		.tuple(rec, fc.array(fc.tuple(hostileString.map((s) => s.slice(0, 50)), hostileString), { maxLength: 2 }))
		.map(([r, extra]) => [...Object.entries(r).filter((e): e is [string, string] => e[1] !== undefined), ...extra]);
}

const key = fc.uuid().map((u) => `fuzz-${u}`);
const MOVE_ACTIONS = ACTIONS.filter((a) => a !== 'receive');

/** Mostly the form the page posts, sometimes a body no form would send. */
function formOr(path: fc.Arbitrary<string>, fields: fc.Arbitrary<[string, string][]>): fc.Arbitrary<FuzzRequest> {
	return fc.oneof(
		{ weight: 6, arbitrary: fc.tuple(path, fields).map(([p, f]): FuzzRequest => ({ path: p, kind: 'form', fields: f })) },
		{
			weight: 1,
			arbitrary: fc
				.tuple(path, fc.constantFrom('application/json', 'text/plain', 'multipart/form-data; boundary=x', 'application/xml'), hostileString)
				.map(([p, contentType, body]): FuzzRequest => ({ path: p, kind: 'raw', contentType, body }))
		}
	);
}

export const FUZZ_TARGETS: FuzzTarget[] = [
	{
		route: '/api/units/[serial=serial]/events',
		method: 'POST',
		as: 'tech',
		request: (f) => {
			const serial = fc.oneof(
				{ weight: 4, arbitrary: fc.constantFrom(...f.serials) },
				{ weight: 1, arbitrary: fc.constantFrom('SY-99999', 'SY-00000', 'sy-00001') },
				{ weight: 1, arbitrary: hostileString.map((s) => encodeURIComponent(s.slice(0, 200)) || 'x') }
			);
			const move = fc.record(
				{
					action: fc.oneof(fc.constantFrom(...MOVE_ACTIONS), hostileValue),
					stationCode: fc.oneof(fc.constantFrom(...f.stationCodes), hostileValue),
					idempotencyKey: fc.oneof({ weight: 3, arbitrary: key }, { weight: 1, arbitrary: hostileValue }),
					expectedVersion: fc.oneof(fc.integer({ min: 1, max: 12 }), hostileValue),
					note: hostileValue,
					data: fc.oneof(
						fc.record({ reasonCode: fc.oneof(fc.constantFrom(...f.scrapReasons), hostileValue), reason: hostileValue, toStage: hostileValue }, { requiredKeys: [] }),
						hostileValue
					)
				},
				{ requiredKeys: [] }
			);
			const body = fc.oneof(
				{ weight: 5, arbitrary: move.map((m) => JSON.stringify(m)) },
				{ weight: 1, arbitrary: fc.jsonValue().map((v) => JSON.stringify(v)) },
				{ weight: 1, arbitrary: hostileString },
				{ weight: 1, arbitrary: fc.constantFrom('{"action":"inspect","expectedVersion":NaN}', '{"a":' .repeat(5000), '[', '{"__proto__":{"admin":true}}') }
			);
			const contentType = fc.oneof(
				{ weight: 6, arbitrary: fc.constant('application/json') },
				{ weight: 1, arbitrary: fc.constantFrom('application/json; charset=utf-8', 'text/plain', 'application/x-www-form-urlencoded', 'application/xml', '') }
			);
			const headers = fc.record(
				{ 'x-forwarded-for': fc.constantFrom('10.0.0.1', '::1', "1.1.1.1' --"), 'user-agent': hostileString.map((s) => s.replace(/[^\x20-\x7e]/g, '').slice(0, 200)) },
				{ requiredKeys: [] }
			);
			return fc
				.tuple(serial, body, contentType, headers)
				.map(([s, b, ct, h]): FuzzRequest => ({ path: `/api/units/${s}/events`, kind: 'raw', body: b, contentType: ct, headers: h }));
		}
	},
	{
		route: '/(app)/stations/[code=code]',
		action: 'scan',
		as: 'tech',
		request: (f) => {
			const code = fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...f.stationCodes) }, { weight: 1, arbitrary: fc.stringMatching(/^[A-Z][A-Z0-9-]{0,12}$/) });
			const fields = formFields(fc.record({ serial: field(fc.constantFrom(...f.serials)), idempotencyKey: field(key) }));
			return formOr(code.map((c) => `/stations/${c}?/scan`), fields);
		}
	},
	{
		route: '/(app)/stations/[code=code]',
		action: 'move',
		as: 'tech',
		request: (f) => {
			const code = fc.constantFrom(...f.stationCodes);
			const fields = formFields(
				fc.record({
					serial: field(fc.constantFrom(...f.serials)),
					action: field(fc.constantFrom(...ACTIONS)),
					reasonCode: field(fc.constantFrom(...f.scrapReasons)),
					reason: field(fc.constantFrom('runs in the paint', 'bearing noise')),
					toStage: field(fc.constantFrom('clean', 'paint', 'machine')),
					note: field(fc.constant('fuzzed')),
					idempotencyKey: field(key)
				})
			);
			return formOr(code.map((c) => `/stations/${c}?/move`), fields);
		}
	},
	{
		route: '/(app)/admin/users',
		action: 'create',
		as: 'owner',
		weight: 0.5,
		request: (f) => {
			const fields = formFields(
				fc.record({
					name: field(fc.constantFrom('Odile Fenwick', 'Bram Castellan')),
					email: field(fc.oneof(fc.constantFrom(...f.emails), fc.uuid().map((u) => `p-${u.slice(0, 8)}@corvidhill.example`))),
					role: field(fc.constantFrom(...ROLES)),
					password: field(fc.constantFrom('a long enough password', 'short'))
				})
			);
			return formOr(fc.constant('/admin/users?/create'), fields);
		}
	},
	{
		route: '/(app)/admin/users',
		action: 'role',
		as: 'owner',
		request: (f) => {
			// not the owner's own id: changing one's own role ends one's own session, which would end the run
			const fields = formFields(fc.record({ id: field(fc.constantFrom(f.victimId, 'no-such-person')), role: field(fc.constantFrom(...ROLES)) }));
			return formOr(fc.constant('/admin/users?/role'), fields);
		}
	},
	{
		route: '/(app)/admin/users',
		action: 'active',
		as: 'owner',
		request: (f) => {
			const fields = formFields(fc.record({ id: field(fc.constantFrom(f.victimId, f.ownerId, 'no-such-person')), active: field(fc.constantFrom('true', 'false')) }));
			return formOr(fc.constant('/admin/users?/active'), fields);
		}
	},
	{
		route: '/(app)/admin/users',
		action: 'lift',
		as: 'owner',
		request: () => {
			// keys that look right but are not locked, and hostile ones: every lift is refused
			const fields = formFields(fc.record({ key: field(fc.constantFrom('account:nobody@corvidhill.example', 'address:203.0.113.9', 'account:', "address:' or 1=1 --")) }));
			return formOr(fc.constant('/admin/users?/lift'), fields);
		}
	},
	{
		route: '/login',
		action: 'default',
		as: 'anon',
		weight: 0.5,
		// a failed sign-in is counted on purpose (lock-out); nothing else may change
		mayWrite: ['sign_in_throttle'],
		request: (f) => {
			const fields = formFields(fc.record({ email: field(fc.constantFrom(...f.emails)), password: field(fc.constantFrom('wrong-password-1', 'tech-demo-2026x')) }));
			return formOr(fc.constant('/login'), fields);
		}
	}
];

/**
 * A form action fuzzed with its own field names carrying plausible-or-hostile values, plus stray
 * fields and bodies no form would send. One line per action below.
 */
function formTarget(route: string, action: string, as: Who, path: (f: FuzzFixtures) => string, names: string[], weight = 0.5, mostlyValid = false): FuzzTarget {
	return {
		route,
		action,
		as,
		weight,
		mostlyValid,
		request: (f) => {
			const plausible = fc.constantFrom(...f.serials, ...f.stationCodes, '1', '0', '12.5', 'true', 'CH-F46', '2026-11-30');
			const rec = Object.fromEntries(names.map((n) => [n, field(plausible)]));
			const url = `${path(f)}${action === 'default' ? '' : `?/${action}`}`;
			return formOr(fc.constant(url), formFields(fc.record(rec)));
		}
	};
}

/** A JSON API mutation fuzzed with hostile bodies. */
function jsonTarget(route: string, as: Who, path: (f: FuzzFixtures) => string, names: string[], weight = 0.5, method = 'POST'): FuzzTarget {
	return {
		route,
		method,
		as,
		weight,
		request: (f) => {
			const body = fc.oneof(
				{ weight: 4, arbitrary: fc.record(Object.fromEntries(names.map((n) => [n, hostileValue])), { requiredKeys: [] }).map((r) => JSON.stringify(r)) },
				{ weight: 1, arbitrary: fc.jsonValue().map((v) => JSON.stringify(v)) },
				{ weight: 1, arbitrary: hostileString }
			);
			const contentType = fc.constantFrom('application/json', 'application/json', 'text/plain', '');
			return fc.tuple(body, contentType).map(([b, ct]): FuzzRequest => ({ path: path(f), kind: 'raw', method, body: b, contentType: ct }));
		}
	};
}

const unitPath = (tail: string) => (f: FuzzFixtures) => `/units/${f.serials[0]}/${tail}`;
const lotPath = (tail = '') => (f: FuzzFixtures) => `/lots/${f.lotCodes[0]}${tail}`;

FUZZ_TARGETS.push(
	formTarget('/(app)/models/[code=code]', 'save', 'owner', (f) => `/models/${f.modelCodes[0]}`, ['rotorMassKg', 'maxServiceRpm', 'gradeG', 'tighteningFactor', 'bearingCompMm', 'bearingTurbMm']),
	formTarget('/(app)/units/[serial=serial]/balance', 'record', 'tech', unitPath('balance'), ['kind', 'aAmount', 'aAngle', 'bAmount', 'bAngle', 'compressorWheelSerial', 'shaftWheelSerial']),
	formTarget('/(app)/units/[serial=serial]/balance', 'balanced', 'tech', unitPath('balance'), ['idempotencyKey', 'stationCode']),
	formTarget('/(app)/units/[serial=serial]/assembly', 'record', 'tech', unitPath('assembly'), ['endPlayMm', 'radialPlayMm', 'bearingKitLot', 'sealKitLot', 'wastegatePresetKpa', 'deviationReason']),
	formTarget('/(app)/units/[serial=serial]/assembly', 'assembled', 'tech', unitPath('assembly'), ['idempotencyKey', 'stationCode']),
	jsonTarget('/api/units/[serial=serial]/balance-runs', 'tech', (f) => `/api/units/${f.serials[0]}/balance-runs`, ['kind', 'readings', 'trial', 'components']),
	jsonTarget('/api/units/[serial=serial]/assembly', 'tech', (f) => `/api/units/${f.serials[0]}/assembly`, ['endPlayMm', 'radialPlayMm', 'bearingKitLot', 'sealKitLot']),
	formTarget('/(app)/orders', 'create', 'office', () => '/orders', ['name', 'email', 'phone', 'address', 'tag', 'modelCode', 'complaint', 'promisedOn']),
	formTarget('/(app)/orders', 'settings', 'owner', () => '/orders', ['taxRatePct']),
	...['addLine', 'removeLine', 'setCore', 'sendQuote', 'withdrawQuote', 'resendLink', 'revokeLink', 'scrapDeclined'].map((a) =>
		formTarget('/(app)/orders/[id=id]', a, 'office', (f) => `/orders/${f.orderIds[0] ?? 999999}`, ['kind', 'description', 'quantity', 'unitPriceCents', 'lineId', 'amountCents'], 0.25, ['resendLink', 'revokeLink'].includes(a))
	),
	formTarget('/(app)/orders/[id=id]', 'sharePhoto', 'office', (f) => `/orders/${f.orderIds[0] ?? 999999}`, ['photoId', 'shared', 'caption'], 0.25),
	formTarget('/(app)/shipments', 'create', 'lead', () => '/shipments', ['destination', 'carrier', 'trackingNumber', 'serials']),
	...['approve', 'decline', 'pay', 'prefs'].map((a) => formTarget('/track/[token]', a, 'anon', () => '/track/not-a-valid-token-at-all', ['choice', 'received', 'shipped'], 0.25)),
	jsonTarget('/api/payments/webhook', 'anon', () => '/api/payments/webhook', ['id', 'type', 'data']),
	formTarget('/(app)/lots/new', 'default', 'office', () => '/lots/new', ['supplierId', 'source', 'receivedOn', 'costPerCore', 'expectedCount', 'notes']),
	formTarget('/(app)/lots/[code=code]', 'add', 'office', lotPath(), ['model', 'originalTag', 'notes']),
	formTarget('/(app)/lots/[code=code]/import', 'preview', 'office', lotPath('/import'), ['csv', 'tagColumn', 'modelColumn', 'notesColumn']),
	formTarget('/(app)/lots/[code=code]/import', 'import', 'office', lotPath('/import'), ['csv', 'tagColumn', 'modelColumn', 'notesColumn', 'token']),
	// a supplier's name and notes are free text: most random values are valid names
	formTarget('/(app)/suppliers', 'create', 'owner', () => '/suppliers', ['name', 'notes'], 0.5, true),
	formTarget('/(app)/suppliers', 'update', 'owner', () => '/suppliers', ['id', 'name', 'notes', 'active']),

	// a checklist's family and name are free text: most random values are valid names
	formTarget('/(app)/admin/checklists', 'create', 'owner', () => '/admin/checklists', ['family', 'name'], 0.5, true),
	formTarget('/(app)/admin/checklists', 'addItem', 'owner', () => '/admin/checklists', ['checklistId', 'label', 'measureUnit']),
	formTarget('/(app)/admin/checklists', 'toggleItem', 'owner', () => '/admin/checklists', ['itemId']),
	formTarget('/(app)/admin/floor', 'assign', 'owner', () => '/admin/floor', ['userId', 'code']),
	formTarget('/(app)/admin/floor', 'overdue', 'owner', () => '/admin/floor', ['code', 'overdueHours']),
	formTarget('/(app)/admin/scrap-reasons', 'add', 'owner', () => '/admin/scrap-reasons', ['code', 'label', 'category']),
	formTarget('/(app)/admin/scrap-reasons', 'rename', 'owner', () => '/admin/scrap-reasons', ['code', 'label', 'category']),
	formTarget('/(app)/admin/scrap-reasons', 'toggle', 'owner', () => '/admin/scrap-reasons', ['code']),
	...['create', 'update', 'close', 'reopen', 'move'].map((a) =>
		formTarget('/(app)/cards', a, 'lead', () => '/cards', ['id', 'version', 'title', 'dueOn', 'style', 'kind', 'model', 'stage', 'lot', 'serials', 'toCard'], 0.25)
	),
	formTarget('/(app)/demand', 'create', 'office', () => '/demand', ['channel', 'reference', 'dueOn', 'model', 'quantity']),
	formTarget('/(app)/demand', 'status', 'office', () => '/demand', ['id', 'status']),
	// a preview only reads the pasted text and answers with what it found: most bodies are fine to preview
	formTarget('/(app)/demand/import', 'preview', 'office', () => '/demand/import', ['text', 'mapped'], 0.5, true),
	formTarget('/(app)/demand/import', 'import', 'office', () => '/demand/import', ['text', 'mapped']),
	formTarget('/(app)/plan', 'alpha', 'owner', () => '/plan', ['alpha']),
	formTarget('/(app)/plan', 'card', 'lead', () => '/plan', ['model']),
	formTarget('/(app)/reports/settings', 'default', 'owner', () => '/reports/settings', ['ratePerHour']),
	formTarget('/(app)/reports/warranty', 'link', 'owner', () => '/reports/warranty', ['returnSerial', 'originalSerial']),
	formTarget('/(app)/reports/warranty/[serial=serial]', 'verdict', 'owner', (f) => `/reports/warranty/${f.serials[0]}`, ['failureMode', 'note', 'verdict']),
	jsonTarget('/api/cards/order', 'lead', () => '/api/cards/order', ['order', 'versions'], 0.5, 'PUT'),
	jsonTarget('/api/units/[serial=serial]/inspection', 'tech', (f) => `/api/units/${f.serials[0]}/inspection`, ['verdict', 'answers', 'reasonCode']),
	jsonTarget('/api/units/[serial=serial]/undo', 'tech', (f) => `/api/units/${f.serials[0]}/undo`, ['idempotencyKey', 'seq'])
);

/** Mutating routes left out of the fuzzing, each with the reason. */
export const NOT_FUZZED: Record<string, string> = {
	'/logout POST': 'takes no input but an `everywhere` flag; every body signs out (tests/server/sign-in.test.ts)'
};
