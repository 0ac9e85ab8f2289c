/**
 * Every mutating API route and form action, with its valid requests: THE place to add a line when
 * a route that changes data lands. The fuzzer (`tests/server/fuzz.test.ts`) sends each target's
 * valid requests and, from them, one field broken at a time, unknown keys, deep nests, huge and
 * blank values and hostile bodies (`vocabulary.ts`). It fails when a mutating route or action has
 * neither a target here nor a reason in NOT_FUZZED.
 *
 * The valid requests are written by hand from each route's own schema and field names (the zod
 * schemas named beside them), with the fixtures' real serials, stations, lots and orders, so that
 * a good share passes validation and reaches the service.
 */
import fc from 'fast-check';
import { ROLES } from '../../src/lib/domain/auth/roles';
import { CARD_STYLE_KEYS } from '../../src/lib/domain/cards/card-style';
import { FAILURE_MODES } from '../../src/lib/domain/warranty/failure-modes';
import { LOT_SOURCE_KEYS } from '../../src/lib/domain/lots/lot';
import { ORDER_CHANNELS } from '../../src/lib/domain/orders/channels';
import { NOTICE_KINDS } from '../../src/lib/domain/customer/progress';
import {
	deepLadder,
	deepValue,
	LADDER,
	encode,
	hostileJsonValue,
	hostileString,
	idempotencyKey as key,
	requestsFrom,
	toJsonText,
	type Encoding,
	type FuzzRequest,
	type Part,
	type Valid
} from './vocabulary';

export type { FuzzRequest } from './vocabulary';
export type Who = 'owner' | 'lead' | 'tech' | 'office' | 'anon';

export interface FuzzFixtures {
	origin: string;
	/** One unit per state (and held), for requests that are usually refused by the state machine. */
	serials: string[];
	/** Units that are not held, by state (the demo's and those the test prepared). */
	byState: Record<string, string[]>;
	held: string[];
	/** Received units of a family with a checklist, kept for the teardown moves. */
	fresh: string[];
	/** Torn-down units of that family, kept for the qualification (multipart) route. */
	forQualification: string[];
	stationCodes: string[];
	/** The station codes of each stage. */
	stations: Record<string, string[]>;
	scrapReasons: string[];
	victimId: string;
	ownerId: string;
	emails: string[];
	lotCodes: string[];
	modelCodes: string[];
	/** Every rebuild order; the ones with a live status link; their tokens (same order). */
	orderIds: number[];
	liveOrderIds: number[];
	tokens: string[];
	/** What each live order is kept for: paying (approved), approving, declining (sent quote), the office's quote work (draft), scrapping (declined, scrap chosen). */
	liveRoles: ('pay' | 'approve' | 'decline' | 'draft' | 'scrap')[];
	/** Units of warranty-return lots not yet linked to the unit they shipped as. */
	warrantyReturns: string[];
	/** A sign-in lock the test made, for the owner to lift. */
	lockedKey: string;
	checklistIds: number[];
	checklistItemIds: number[];
	supplierIds: number[];
	cardIds: number[];
	demandOrderIds: number[];
	/** Teardown photos of customers' units, and the orders of those units. */
	photoIds: number[];
	photoOrderIds: number[];
	/** The spec of the first model, as the owner's form sends it. */
	spec: Record<string, string>;
	/** A small real photo (PNG) and its thumbnail-sized JPEG twin. */
	png: Buffer;
	jpeg: Buffer;
	/** Signs a webhook payload with the test secret (the payment fake's). */
	sign(payload: string): string;
}

export interface FuzzTarget {
	/** Route id, and the method or form action it exercises. */
	route: string;
	method?: string;
	action?: string;
	as: Who;
	/** The requests: from `valid` through the generator, or a request arbitrary of the target's own. */
	request(f: FuzzFixtures): fc.Arbitrary<FuzzRequest>;
	/** Tables a rejected request may still write, on purpose (say why). */
	mayWrite?: string[];
	/** Pages that show what this target writes (besides the unit, lot, order and track pages found from the request). */
	shows?: (f: FuzzFixtures) => string[];
	/** Fields that hold a required number: a blank there must be refused, never read as 0. */
	requiredNumbers?: string[];
	/** The target redirects off the site on purpose (the payment checkout). */
	offsite?: boolean;
	/** Requests every run sends first, whatever the seed (the deep-nesting ladder), within the per-target count. */
	ladder?(f: FuzzFixtures, seed: number): FuzzRequest[];
	/** Multiple of the per-target count (1 by default; never less, so every target gets at least FUZZ_PER_TARGET). */
	weight?: number;
}

const pick = <T>(xs: readonly T[], fallback: T): fc.Arbitrary<T> => (xs.length ? fc.constantFrom(...xs) : fc.constant(fallback));
const some = (f: FuzzFixtures, ...states: string[]) => states.flatMap((s) => f.byState[s] ?? []);

/** A target whose valid requests go through the generator. */
function target(t: Omit<FuzzTarget, 'request'> & { encoding: Encoding; valid(f: FuzzFixtures): fc.Arbitrary<Valid> }): FuzzTarget {
	const { encoding, valid, ...rest } = t;
	return {
		...rest,
		request: (f) => requestsFrom(encoding, valid(f), t.method),
		ladder: (f, seed) => deepLadder(encoding, fc.sample(valid(f), { numRuns: LADDER.length, seed }))
	};
}

const at = (path: string, body: Record<string, unknown>, extra: Partial<Valid> = {}): Valid => ({ path, body, ...extra });

// ---- units: moves, scans, qualification, undo ----

/** A move that the state machine allows from the unit's state, made at a station of the right stage. */
function stageMoves(f: FuzzFixtures) {
	const M: [string, string, string][] = [
		['received', 'inspect', 'teardown'],
		['accepted', 'clean', 'clean'],
		['cleaned', 'machine', 'machine'],
		['machined', 'paint', 'paint'],
		['painted', 'assemble', 'assemble'],
		['assembled', 'balance', 'balance'],
		['balanced', 'pack', 'pack'],
		['packed', 'ship', 'ship']
	];
	return fc.oneof(
		...M.filter(([s]) => (f.byState[s] ?? []).length).map(([s, action, stage]) =>
			fc.record({ serial: pick(f.byState[s], 'SY-99999'), action: fc.constant(action), stationCode: pick(f.stations[stage] ?? [], 'TEARDOWN-1') })
		),
		fc.record({ serial: pick(f.fresh, 'SY-99999'), action: fc.constant('inspect'), stationCode: pick(f.stations.teardown ?? [], 'TEARDOWN-1') })
	);
}

const REASONS = ['bearing noise at idle', 'oil weep at the seal plate', 'customer asked to wait', 'wheel rub marks'];

/** Any move a tech makes from the board, with the data it needs (see `actionData` in units/actions.ts). */
function moveBody(f: FuzzFixtures) {
	const active = some(f, 'received', 'inspected', 'accepted', 'cleaned', 'machined', 'painted', 'assembled', 'balanced', 'packed');
	const anyStation = pick(f.stationCodes, 'TEARDOWN-1');
	return fc.oneof(
		{ weight: 4, arbitrary: fc.record({ serial: pick(active, 'SY-99999'), action: fc.constant('hold'), stationCode: anyStation, data: fc.record({ reason: fc.constantFrom(...REASONS) }) }) },
		{ weight: 2, arbitrary: fc.record({ serial: pick([...f.held, ...active], 'SY-99999'), action: fc.constant('release'), stationCode: anyStation, data: fc.constant({}) }) },
		{ weight: 3, arbitrary: stageMoves(f).map((m) => ({ ...m, data: {} })) },
		{
			weight: 1,
			arbitrary: fc.record({ serial: pick(some(f, 'inspected'), 'SY-99999'), action: fc.constant('scrap'), stationCode: pick(f.stations.teardown ?? [], 'TEARDOWN-1'), data: fc.record({ reasonCode: pick(f.scrapReasons, 'X') }) })
		},
		{ weight: 1, arbitrary: fc.record({ serial: pick(some(f, 'inspected'), 'SY-99999'), action: fc.constant('accept'), stationCode: pick(f.stations.teardown ?? [], 'TEARDOWN-1'), data: fc.constant({}) }) }
	);
}

const eventsTarget = target({
	route: '/api/units/[serial=serial]/events',
	method: 'POST',
	as: 'tech',
	encoding: 'json',
	weight: 2,
	// moveRequestSchema (src/lib/move-request.ts) and scanRequestSchema (the route)
	valid: (f) =>
		fc.oneof(
			{
				weight: 5,
				arbitrary: fc
					.tuple(moveBody(f), key, fc.option(fc.constantFrom('checked by two people', 'rush'), { nil: undefined }))
					.map(([m, k, note]) => at(`/api/units/${m.serial}/events`, { action: m.action, stationCode: m.stationCode, idempotencyKey: k, ...(note ? { note } : {}), data: m.data }))
			},
			{
				weight: 1,
				arbitrary: fc
					.tuple(stageMoves(f), key)
					.map(([m, k]) => at(`/api/units/${m.serial}/events`, { scan: true, stationCode: m.stationCode, idempotencyKey: k }, { headers: { 'x-spoolyard-scan': '1' } }))
			}
		)
});

const stationScan = target({
	route: '/(app)/stations/[code=code]',
	action: 'scan',
	as: 'tech',
	encoding: 'form',
	valid: (f) => fc.tuple(stageMoves(f), key).map(([m, k]) => at(`/stations/${m.stationCode}?/scan`, { serial: m.serial, idempotencyKey: k }))
});

const stationMove = target({
	route: '/(app)/stations/[code=code]',
	action: 'move',
	as: 'tech',
	encoding: 'form',
	valid: (f) =>
		fc.tuple(moveBody(f), key, fc.constantFrom('', 'fuzzed')).map(([m, k, note]) =>
			at(`/stations/${m.stationCode}?/move`, { serial: m.serial, action: m.action, ...(m.data as Record<string, string>), note, idempotencyKey: k })
		)
});

/** The JPEG with a comment segment (COM, FF FE) of the given bytes after its start marker: a new file each time, the same picture. */
function jpegWith(jpeg: Buffer, comment: Uint8Array): Buffer {
	const len = Buffer.alloc(2);
	len.writeUInt16BE(comment.length + 2);
	return Buffer.concat([jpeg.subarray(0, 2), Buffer.from([0xff, 0xfe]), len, comment, jpeg.subarray(2)]);
}

function photoPart(f: FuzzFixtures): fc.Arbitrary<Part> {
	return fc.oneof(
		{ weight: 1, arbitrary: fc.constant<Part>({ name: 'photos', filename: 'housing.png', type: 'image/png', bytes: f.png }) },
		{ weight: 3, arbitrary: fc.uint8Array({ minLength: 8, maxLength: 32 }).map((c): Part => ({ name: 'photos', filename: 'wheel.jpg', type: 'image/jpeg', bytes: jpegWith(f.jpeg, c) })) },
		{
			weight: 1,
			arbitrary: fc.oneof(
				// bytes that are not the image they claim to be, truncated images, a name that is a path
				fc.uint8Array({ minLength: 1, maxLength: 2000 }).map((b): Part => ({ name: 'photos', filename: 'photo.jpg', type: 'image/jpeg', bytes: Buffer.from(b) })),
				fc.constant<Part>({ name: 'photos', filename: '../../etc/passwd', type: 'image/png', bytes: f.png.subarray(0, 60) }),
				fc.constant<Part>({ name: 'photos', filename: '<svg onload=alert(1)>.svg', type: 'image/svg+xml', bytes: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>') }),
				fc.constant<Part>({ name: 'photos', filename: 'big.png', type: 'image/png', bytes: Buffer.concat([f.png, Buffer.alloc(8 * 1024 * 1024 + 1)]) })
			)
		}
	);
}

/** The teardown qualification as the board posts it (multipart; the field names the route reads). */
const inspectionTarget = target({
	route: '/api/units/[serial=serial]/inspection',
	method: 'POST',
	as: 'tech',
	encoding: 'multipart',
	valid: (f) =>
		fc
			.tuple(
				// mostly units waiting for their verdict; now and then one already shipped (409) or unknown (404)
				fc.oneof({ weight: 6, arbitrary: pick([...f.forQualification, ...some(f, 'inspected')], 'SY-99999') }, { weight: 1, arbitrary: pick([...some(f, 'shipped').slice(0, 5), 'SY-99999'], 'SY-99999') }),
				fc.constantFrom('accept', 'accept', 'scrap'),
				pick(f.scrapReasons, 'X'),
				key,
				fc.array(fc.constantFrom('pass', 'fail', 'na'), { minLength: f.checklistItemIds.length, maxLength: f.checklistItemIds.length }),
				fc.array(photoPart(f), { maxLength: 3 }),
				fc.constantFrom('', '25', '90')
			)
			.map(([serial, verdict, reasonCode, k, results, photos, minutes]) => {
				const body: Record<string, unknown> = { idempotencyKey: k, stationCode: f.stations.teardown?.[0] ?? 'TEARDOWN-1', verdict, note: 'shaft play within limits', labourMinutes: minutes };
				if (verdict === 'scrap') body.reasonCode = reasonCode;
				f.checklistItemIds.forEach((id, i) => {
					body[`result-${id}`] = verdict === 'accept' ? 'pass' : results[i];
					body[`measure-${id}`] = '0.05';
				});
				if (photos.length) body.photos = photos;
				return at(`/api/units/${serial}/inspection`, body);
			})
});

const undoTarget = target({
	route: '/api/units/[serial=serial]/undo',
	method: 'POST',
	as: 'tech',
	encoding: 'json',
	// undoSchema in the route
	valid: (f) => fc.tuple(pick(f.stationCodes.length ? [...some(f, 'inspected', 'accepted', 'cleaned'), ...f.fresh] : [], 'SY-99999'), key, pick(f.stationCodes, 'TEARDOWN-1')).map(([s, k, st]) => at(`/api/units/${s}/undo`, { idempotencyKey: k, stationCode: st }))
});

// ---- balancing and assembly ----

/** balanceRunInput (src/lib/domain/balance/records.ts); a check run of an assembled unit. */
const runBody = (kind: 'initial' | 'check' | 'trial') => ({
	kind,
	...(kind === 'trial' ? { trialPlane: 'comp', trialAmount: '40', trialAngle: '90' } : {}),
	compAmount: '2.5',
	compAngle: '120',
	turbAmount: '1.5',
	turbAngle: '300',
	speedRpm: '2400',
	compWheelSerial: 'CW-1138',
	shaftWheelSerial: 'SW-2270',
	note: ''
});
/** assemblyInput (records.ts); inside the demo model's limits. */
const assemblyBody = { endPlayMm: '0.05', radialPlayMm: '0.45', bearingKitLot: 'BK-26-114', sealKitLot: 'SK-26-031', compWheelSerial: 'CW-1138', shaftWheelSerial: 'SW-2270', wastegatePresetKpa: '100', deviationReason: '', note: '' };
const READINGS = ['compAmount', 'compAngle', 'turbAmount', 'turbAngle'];

const balanceRecord = target({
	route: '/(app)/units/[serial=serial]/balance',
	action: 'record',
	as: 'tech',
	encoding: 'form',
	requiredNumbers: READINGS,
	valid: (f) => fc.tuple(pick(some(f, 'assembled'), 'SY-99999'), fc.constantFrom('initial', 'check', 'check', 'trial' as const)).map(([s, kind]) => at(`/units/${s}/balance?/record`, runBody(kind)))
});
const balanceBalanced = target({
	route: '/(app)/units/[serial=serial]/balance',
	action: 'balanced',
	as: 'tech',
	encoding: 'form',
	valid: (f) => fc.tuple(pick(some(f, 'assembled'), 'SY-99999'), key).map(([s, k]) => at(`/units/${s}/balance?/balanced`, { idempotencyKey: k }))
});
const assemblyRecord = target({
	route: '/(app)/units/[serial=serial]/assembly',
	action: 'record',
	as: 'tech',
	encoding: 'form',
	requiredNumbers: ['endPlayMm', 'radialPlayMm'],
	valid: (f) => pick(some(f, 'painted'), 'SY-99999').map((s) => at(`/units/${s}/assembly?/record`, assemblyBody))
});
const assemblyAssembled = target({
	route: '/(app)/units/[serial=serial]/assembly',
	action: 'assembled',
	as: 'tech',
	encoding: 'form',
	valid: (f) => fc.tuple(pick(some(f, 'painted'), 'SY-99999'), key).map(([s, k]) => at(`/units/${s}/assembly?/assembled`, { idempotencyKey: k }))
});
const balanceRunsApi = target({
	route: '/api/units/[serial=serial]/balance-runs',
	method: 'POST',
	as: 'tech',
	encoding: 'json',
	requiredNumbers: READINGS,
	valid: (f) =>
		fc
			.tuple(pick(some(f, 'assembled'), 'SY-99999'), fc.constantFrom('initial', 'check', 'check' as const), fc.boolean())
			.map(([s, kind, numbers]) => {
				const body: Record<string, unknown> = { ...runBody(kind), stationCode: f.stations.balance?.[0] ?? 'BALANCE' };
				if (numbers) for (const k of [...READINGS, 'speedRpm']) body[k] = Number(body[k]);
				return at(`/api/units/${s}/balance-runs`, body);
			})
});
const assemblyApi = target({
	route: '/api/units/[serial=serial]/assembly',
	method: 'POST',
	as: 'tech',
	encoding: 'json',
	requiredNumbers: ['endPlayMm', 'radialPlayMm'],
	valid: (f) => pick(some(f, 'painted'), 'SY-99999').map((s) => at(`/api/units/${s}/assembly`, { ...assemblyBody, endPlayMm: 0.05, radialPlayMm: 0.45, stationCode: f.stations.assemble?.[0] ?? 'BUILD-1' }))
});

// ---- people and sign-in ----

const usersCreate = target({
	route: '/(app)/admin/users',
	action: 'create',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/users'],
	// newUserSchema (src/lib/server/users.ts)
	valid: (f) =>
		fc
			.record({ name: fc.constantFrom('Odile Fenwick', 'Bram Castellan'), email: fc.oneof(pick(f.emails, 'x@corvidhill.example'), fc.uuid().map((u) => `p-${u.slice(0, 8)}@corvidhill.example`)), role: fc.constantFrom(...ROLES), password: fc.constant('a long enough password') })
			.map((b) => at('/admin/users?/create', b))
});
const usersRole = target({
	route: '/(app)/admin/users',
	action: 'role',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/users'],
	// not the owner's own id: changing one's own role ends one's own session, which would end the run
	valid: (f) => fc.record({ id: fc.constant(f.victimId), role: fc.constantFrom(...ROLES) }).map((b) => at('/admin/users?/role', b))
});
const usersActive = target({
	route: '/(app)/admin/users',
	action: 'active',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/users'],
	valid: (f) => fc.record({ id: fc.constantFrom(f.victimId, f.victimId, f.ownerId), active: fc.constantFrom('true', 'false') }).map((b) => at('/admin/users?/active', b))
});
const usersLift = target({
	route: '/(app)/admin/users',
	action: 'lift',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/users'],
	// the lock the test made (lifted once; then the service says it has ended) and a key that is not locked
	valid: (f) => fc.constantFrom(f.lockedKey, f.lockedKey, 'address:203.0.113.9').map((k) => at('/admin/users?/lift', { key: k }))
});
const login = target({
	route: '/login',
	action: 'default',
	as: 'anon',
	encoding: 'form',
	// a failed sign-in is counted on purpose (lock-out); nothing else may change
	mayWrite: ['sign_in_throttle'],
	valid: (f) =>
		fc
			.tuple(
				fc.constantFrom('/login', '/login?next=/units', '/login?next=/%5Cevil.example/phish', '/login?next=/%09/evil.example', '/login?next=//evil.example', '/login?next=/%2F%2Fevil.example'),
				fc.constantFrom<[string, string]>(['gale@corvidhill.example', 'another long password'], ['gale@corvidhill.example', 'another long password'], ['nobody@corvidhill.example', 'wrong-password-1'], [f.emails[0], 'wrong-password-1'])
			)
			.map(([path, [email, password]]) => at(path, { email, password }))
});

// ---- lots, suppliers, imports ----

const lotsNew = target({
	route: '/(app)/lots/new',
	action: 'default',
	as: 'office',
	encoding: 'form',
	requiredNumbers: ['expectedCount'],
	shows: () => ['/lots', '/lots.csv'],
	// lotFormSchema (src/lib/domain/lots/lot.ts)
	valid: (f) =>
		fc
			.record({ supplierId: pick(f.supplierIds.map(String), '1'), source: fc.constantFrom(...LOT_SOURCE_KEYS), receivedOn: fc.constantFrom('2026-11-02', new Date().toISOString().slice(0, 10)), costPerCore: fc.constantFrom('45', '45.50', '0'), expectedCount: fc.constantFrom('12', '1', '0'), notes: fc.constantFrom('', 'two skids, wet') })
			.map((b) => at('/lots/new', b))
});
const lotsAdd = target({
	route: '/(app)/lots/[code=code]',
	action: 'add',
	as: 'office',
	encoding: 'form',
	// unitDraftSchema (lot.ts)
	valid: (f) => fc.record({ code: pick(f.lotCodes, 'L000000-00'), model: pick(f.modelCodes, 'CH-F46'), originalTag: fc.constantFrom('', 'T-4471', 'tag lost'), notes: fc.constantFrom('', 'housing cracked') }).map(({ code, ...b }) => at(`/lots/${code}?/add`, b))
});
const MANIFEST = (f: FuzzFixtures) => `tag,model,notes\nT-1,${f.modelCodes[0]},dented\nT-2,${f.modelCodes[1] ?? f.modelCodes[0]},\n`;
const lotsPreview = target({
	route: '/(app)/lots/[code=code]/import',
	action: 'preview',
	as: 'office',
	encoding: 'form',
	valid: (f) => pick(f.lotCodes, 'L000000-00').map((code) => at(`/lots/${code}/import?/preview`, { text: MANIFEST(f), 'map.originalTag': '0', 'map.model': '1', 'map.notes': '2', fileName: 'manifest.csv' }))
});
const lotsImport = target({
	route: '/(app)/lots/[code=code]/import',
	action: 'import',
	as: 'office',
	encoding: 'form',
	valid: (f) =>
		fc.tuple(pick(f.lotCodes, 'L000000-00'), fc.uuid()).map(([code, u]) =>
			at(`/lots/${code}/import?/import`, { text: `tag,model,notes\nF-${u.slice(0, 8)},${f.modelCodes[0]},dented\n`, 'map.originalTag': '0', 'map.model': '1', 'map.notes': '2', expectedGood: '1', fileName: 'manifest.csv' })
		)
});
const suppliersCreate = target({
	route: '/(app)/suppliers',
	action: 'create',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/suppliers', '/lots/new', '/reports/suppliers', '/api/reports/suppliers'],
	// supplierSchema (lot.ts)
	valid: () => fc.record({ name: fc.uuid().map((u) => `Fuzz Salvage ${u.slice(0, 8)}`), notes: fc.constantFrom('', 'pays on delivery') }).map((b) => at('/suppliers?/create', b))
});
const suppliersUpdate = target({
	route: '/(app)/suppliers',
	action: 'update',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/suppliers', '/lots/new', '/reports/suppliers', '/api/reports/suppliers'],
	valid: (f) => fc.record({ id: pick(f.supplierIds.map(String), '1'), name: fc.uuid().map((u) => `Renamed Salvage ${u.slice(0, 8)}`), notes: fc.constantFrom('', 'new terms'), active: fc.constantFrom('on', '') }).map((b) => at('/suppliers?/update', b))
});

// ---- models, checklists, floor, scrap reasons ----

const modelsSave = target({
	route: '/(app)/models/[code=code]',
	action: 'save',
	as: 'owner',
	encoding: 'form',
	requiredNumbers: ['rotorMassKg', 'maxServiceRpm', 'gradeG', 'tighteningFactor'],
	shows: (f) => ['/models', ...f.modelCodes.slice(0, 1).map((c) => `/models/${c}`)],
	// specSchema (src/lib/domain/balance/spec.ts): the stored spec as the form sends it back
	valid: (f) => fc.constant(at(`/models/${f.modelCodes[0]}?/save`, f.spec))
});
const checklistCreate = target({
	route: '/(app)/admin/checklists',
	action: 'create',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/checklists'],
	valid: () => fc.record({ family: fc.constantFrom('F', 'V', 'K', 'P', 'Q'), name: fc.constantFrom('Teardown check', 'Core check') }).map((b) => at('/admin/checklists?/create', b))
});
const checklistAdd = target({
	route: '/(app)/admin/checklists',
	action: 'addItem',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/checklists'],
	valid: (f) => fc.record({ checklistId: pick(f.checklistIds.map(String), '1'), label: fc.constantFrom('Shaft play', 'Housing cracks'), measureUnit: fc.constantFrom('', 'mm') }).map((b) => at('/admin/checklists?/addItem', b))
});
const checklistToggle = target({
	route: '/(app)/admin/checklists',
	action: 'toggleItem',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/checklists'],
	// always back to active, so that the qualification route keeps its checklist
	valid: (f) => fc.record({ itemId: pick(f.checklistItemIds.map(String), '1'), active: fc.constant('1') }).map((b) => at('/admin/checklists?/toggleItem', b))
});
const floorAssign = target({
	route: '/(app)/admin/floor',
	action: 'assign',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/floor', '/stations'],
	valid: (f) => fc.record({ userId: fc.constant(f.victimId), stations: fc.subarray(f.stationCodes, { maxLength: 3 }) }).map((b) => at('/admin/floor?/assign', b))
});
const floorOverdue = target({
	route: '/(app)/admin/floor',
	action: 'overdue',
	as: 'owner',
	encoding: 'form',
	requiredNumbers: ['overdueHours'],
	shows: (f) => ['/admin/floor', ...f.stationCodes.slice(0, 2).map((c) => `/api/stations/${c}/board`)],
	valid: (f) => fc.record({ code: pick(f.stationCodes, 'WASH'), overdueHours: fc.constantFrom('4', '8', '24', '1.5') }).map((b) => at('/admin/floor?/overdue', b))
});
const reasonsAdd = target({
	route: '/(app)/admin/scrap-reasons',
	action: 'add',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/scrap-reasons', '/reports/scrap', '/api/reports/scrap'],
	valid: () => fc.record({ code: fc.uuid().map((u) => `FZ-${u.slice(0, 6).toUpperCase()}`), label: fc.constantFrom('Cracked flange', 'Seized shaft'), category: fc.constantFrom('housing', 'rotating', 'other') }).map((b) => at('/admin/scrap-reasons?/add', b))
});
const reasonsRename = target({
	route: '/(app)/admin/scrap-reasons',
	action: 'rename',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/scrap-reasons', '/reports/scrap', '/api/reports/scrap'],
	valid: (f) => fc.record({ code: pick(f.scrapReasons, 'X'), label: fc.constantFrom('Cracked flange', 'Seized shaft') }).map((b) => at('/admin/scrap-reasons?/rename', b))
});
const reasonsToggle = target({
	route: '/(app)/admin/scrap-reasons',
	action: 'toggle',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/admin/scrap-reasons'],
	// back in use every time, so that the scrap moves keep their reasons
	valid: (f) => pick(f.scrapReasons, 'X').map((code) => at('/admin/scrap-reasons?/toggle', { code, active: '1' }))
});

// ---- cards, demand, plan ----

const cardBody = (f: FuzzFixtures) =>
	fc.record({
		title: fc.constantFrom('Rush for the north depot', 'Finish the painted ones'),
		dueOn: fc.constantFrom('', '2026-12-20'),
		style: fc.constantFrom(...CARD_STYLE_KEYS),
		kind: fc.constantFrom('units', 'rule'),
		ruleModel: pick(f.modelCodes, ''),
		ruleStage: fc.constantFrom('', 'clean', 'paint'),
		ruleLot: fc.constant(''),
		serials: fc.subarray(some(f, 'received', 'accepted'), { maxLength: 3 }).map((s) => s.join(' '))
	});
const cardsTargets = [
	target({ route: '/(app)/cards', action: 'create', as: 'lead', encoding: 'form', shows: () => ['/cards', '/api/cards'], valid: (f) => cardBody(f).map((b) => at('/cards?/create', b)) }),
	target({
		route: '/(app)/cards',
		action: 'update',
		as: 'lead',
		encoding: 'form',
		shows: () => ['/cards', '/api/cards'],
		valid: (f) => fc.tuple(cardBody(f), pick(f.cardIds.map(String), '1'), fc.integer({ min: 1, max: 6 })).map(([b, id, v]) => at('/cards?/update', { ...b, id, version: String(v) }))
	}),
	...(['close', 'reopen'] as const).map((a) =>
		target({ route: '/(app)/cards', action: a, as: 'lead', encoding: 'form', shows: () => ['/cards', '/api/cards'], valid: (f) => fc.tuple(pick(f.cardIds.map(String), '1'), fc.integer({ min: 1, max: 6 })).map(([id, v]) => at(`/cards?/${a}`, { id, version: String(v) })) })
	),
	target({
		route: '/(app)/cards',
		action: 'move',
		as: 'lead',
		encoding: 'form',
		shows: () => ['/cards', '/api/cards'],
		valid: (f) => fc.tuple(fc.subarray(some(f, 'received', 'accepted', 'cleaned'), { minLength: 1, maxLength: 3 }), fc.oneof(pick(f.cardIds.map(String), '1'), fc.constant('none'))).map(([serial, to]) => at('/cards?/move', { serial, to, more: '' }))
	})
];
const cardsOrder: FuzzTarget = {
	...target({
		route: '/api/cards/order',
		method: 'PUT',
		as: 'lead',
		encoding: 'json',
		shows: () => ['/cards', '/api/cards'],
		valid: (f) => fc.shuffledSubarray(f.cardIds, { minLength: f.cardIds.length, maxLength: f.cardIds.length }).chain((ids) => fc.array(fc.integer({ min: 1, max: 4 }), { minLength: ids.length, maxLength: ids.length }).map((vs) => at('/api/cards/order', { order: ids.map((id, i) => ({ id, version: vs[i] })) }, { method: 'PUT' })))
	})
};
const demandCreate = target({
	route: '/(app)/demand',
	action: 'create',
	as: 'office',
	encoding: 'form',
	shows: () => ['/demand', '/plan', '/stock'],
	// orderInputSchema (src/lib/server/orders.ts)
	valid: (f) =>
		fc
			.record({ ref: fc.uuid().map((u) => `FZ-${u.slice(0, 8)}`), channel: fc.constantFrom(...ORDER_CHANNELS), customer: fc.constantFrom('', 'Harrow Fleet'), orderedOn: fc.constantFrom('', '2026-11-20'), dueOn: fc.constantFrom('', '2026-12-15'), notes: fc.constant(''), model: pick(f.modelCodes, 'CH-F46'), quantity: fc.constantFrom('1', '4', '12') })
			.map((b) => at('/demand?/create', b))
});
const demandStatus = target({
	route: '/(app)/demand',
	action: 'status',
	as: 'office',
	encoding: 'form',
	shows: () => ['/demand', '/plan'],
	valid: (f) => fc.record({ id: pick(f.demandOrderIds.map(String), '1'), status: fc.constantFrom('open', 'fulfilled', 'cancelled') }).map((b) => at('/demand?/status', b))
});
const DEMAND_CSV = (f: FuzzFixtures, ref: string) => `ref,channel,model,quantity,due\n${ref},web,${f.modelCodes[0]},2,2026-12-10\n`;
const demandPreview = target({
	route: '/(app)/demand/import',
	action: 'preview',
	as: 'office',
	encoding: 'form',
	valid: (f) => fc.constant(at('/demand/import?/preview', { text: DEMAND_CSV(f, 'FZ-PREVIEW'), mapped: '1', map_ref: 'ref', map_channel: 'channel', map_model: 'model', map_quantity: 'quantity', map_dueOn: 'due' }))
});
const demandImport = target({
	route: '/(app)/demand/import',
	action: 'import',
	as: 'office',
	encoding: 'form',
	shows: () => ['/demand', '/plan'],
	valid: (f) => fc.uuid().map((u) => at('/demand/import?/import', { text: DEMAND_CSV(f, `FZ-${u.slice(0, 8)}`), mapped: '1', map_ref: 'ref', map_channel: 'channel', map_model: 'model', map_quantity: 'quantity', map_dueOn: 'due' }))
});
const planAlpha = target({ route: '/(app)/plan', action: 'alpha', as: 'owner', encoding: 'form', requiredNumbers: ['alpha'], shows: () => ['/plan'], valid: () => fc.constantFrom('0.3', '0.5', '0.15').map((a) => at('/plan?/alpha', { alpha: a })) });
const planCard = target({ route: '/(app)/plan', action: 'card', as: 'lead', encoding: 'form', shows: () => ['/plan', '/cards'], valid: (f) => pick(f.modelCodes, 'CH-F46').map((m) => at('/plan?/card', { model: m })) });

// ---- reports ----

const labourRate = target({ route: '/(app)/reports/settings', action: 'default', as: 'owner', encoding: 'form', requiredNumbers: ['ratePerHour'], shows: () => ['/reports/settings', '/reports/scrap', '/api/reports/scrap'], valid: () => fc.constantFrom('85', '92.50', '0').map((r) => at('/reports/settings', { ratePerHour: r })) });
const warrantyLink = target({
	route: '/(app)/reports/warranty',
	action: 'link',
	as: 'owner',
	encoding: 'form',
	shows: () => ['/reports/warranty', '/api/reports/warranty'],
	valid: (f) => fc.record({ returnSerial: pick(f.warrantyReturns, 'SY-99999'), originalSerial: pick(some(f, 'shipped'), 'SY-99999') }).map((b) => at('/reports/warranty?/link', b))
});
const warrantyVerdict = target({
	route: '/(app)/reports/warranty/[serial=serial]',
	action: 'verdict',
	as: 'owner',
	encoding: 'form',
	requiredNumbers: ['expectedVersion'],
	valid: (f) =>
		fc
			.tuple(pick(some(f, 'inspected'), 'SY-99999'), fc.constantFrom('accept', 'scrap'), fc.constantFrom(...FAILURE_MODES), pick(f.scrapReasons, 'X'), fc.constantFrom('', '30'), key, fc.integer({ min: 1, max: 6 }))
			.map(([s, verdict, failureMode, reasonCode, labourMinutes, k, v]) => at(`/reports/warranty/${s}?/verdict`, { verdict, failureMode, reasonCode, labourMinutes, idempotencyKey: k, expectedVersion: String(v) }))
});

// ---- customer orders: office, shipments, the customer's own page, payments ----

const orderCreate = target({
	route: '/(app)/orders',
	action: 'create',
	as: 'office',
	encoding: 'form',
	shows: () => ['/orders'],
	// newOrderSchema (src/lib/server/rebuild-orders.ts): the form's own names
	valid: (f) =>
		fc
			.record({ customerName: fc.constantFrom('Maren Holt', 'Osei Brandvold'), email: fc.uuid().map((u) => `c-${u.slice(0, 8)}@customer.example`), phone: fc.constantFrom('', '555 0134'), shipAddress: fc.constant('14 Kiln Road, Westmere'), modelCode: pick(f.modelCodes, 'CH-F46'), originalTag: fc.constantFrom('CT-1', 'no tag'), complaint: fc.constant('Whistles under boost.'), promisedOn: fc.constantFrom('', '2026-12-18'), notifyReceived: fc.constantFrom('on', ''), notifyShipped: fc.constantFrom('on', '') })
			.map((b) => at('/orders?/create', b))
});
const orderSettings = target({
	route: '/(app)/orders',
	action: 'settings',
	as: 'owner',
	encoding: 'form',
	requiredNumbers: ['taxRatePercent'],
	shows: (f) => ['/orders', ...f.orderIds.slice(0, 1).map((id) => `/orders/${id}`), ...f.tokens.slice(0, 1).map((t) => `/track/${t}`)],
	valid: () => fc.record({ shopName: fc.constant('Corvid Hill Turbo Works'), taxRatePercent: fc.constantFrom('8.25', '0', '12') }).map((b) => at('/orders?/settings', b))
});

const liveFor = (f: FuzzFixtures, role: FuzzFixtures['liveRoles'][number]) => f.liveOrderIds.filter((_, i) => f.liveRoles[i] === role);
const tokensFor = (f: FuzzFixtures, role: FuzzFixtures['liveRoles'][number] | null) => f.tokens.filter((_, i) => role === null || f.liveRoles[i] === role);

/** The office's quote work, on orders kept with a draft quote (scrapping on those the customer declined, asking for it). */
function orderAction(a: string, body: (f: FuzzFixtures) => fc.Arbitrary<Record<string, unknown>>, as: Who = 'office', requiredNumbers?: string[]): FuzzTarget {
	return target({
		route: '/(app)/orders/[id=id]',
		action: a,
		as,
		encoding: 'form',
		requiredNumbers,
		valid: (f) => fc.tuple(pick(liveFor(f, a === 'scrapDeclined' ? 'scrap' : 'draft'), 999_999), body(f)).map(([id, b]) => at(`/orders/${id}?/${a}`, b))
	});
}
const orderActions = [
	orderAction('addLine', () => fc.record({ kind: fc.constantFrom('part', 'labour'), description: fc.constantFrom('Bearing kit', 'Balance and test'), quantity: fc.constantFrom('1', '2', '1.5'), unitPrice: fc.constantFrom('125.00', '48', '0') }), 'office', ['quantity', 'unitPrice']),
	orderAction('removeLine', () => fc.record({ lineId: fc.integer({ min: 1, max: 40 }).map(String) })),
	orderAction('setCore', () => fc.record({ core: fc.constantFrom('-150.00', '75', '0'), coreNote: fc.constantFrom('', 'core returned in good shape') })),
	orderAction('sendQuote', () => fc.constant({})),
	orderAction('withdrawQuote', () => fc.constant({})),
	// a new link e-mails a new token and ends the old one: only on orders without the test's live links
	target({ route: '/(app)/orders/[id=id]', action: 'resendLink', as: 'office', encoding: 'form', valid: (f) => pick(f.orderIds.filter((id) => !f.liveOrderIds.includes(id)), 999_999).map((id) => at(`/orders/${id}?/resendLink`, {})) }),
	target({ route: '/(app)/orders/[id=id]', action: 'revokeLink', as: 'office', encoding: 'form', valid: (f) => pick(f.orderIds.filter((id) => !f.liveOrderIds.includes(id)), 999_999).map((id) => at(`/orders/${id}?/revokeLink`, {})) }),
	orderAction('scrapDeclined', () => fc.constant({}), 'lead'),
	target({
		route: '/(app)/orders/[id=id]',
		action: 'sharePhoto',
		as: 'office',
		encoding: 'form',
		// shareFormSchema (src/lib/server/photo-sharing.ts), on an order whose unit has teardown photos
		valid: (f) =>
			fc
				.record({ id: pick(f.photoOrderIds, 999_999), photoId: pick(f.photoIds.map(String), '1'), shared: fc.constantFrom('true', 'false'), caption: fc.constantFrom('', 'Compressor wheel, inlet side') })
				.map(({ id, ...b }) => at(`/orders/${id}?/sharePhoto`, b))
	})
];
const shipmentCreate = target({
	route: '/(app)/shipments',
	action: 'create',
	as: 'lead',
	encoding: 'form',
	shows: () => ['/shipments', '/stock'],
	// newShipmentSchema (src/lib/server/shipments.ts)
	valid: (f) =>
		fc
			.record({ destination: fc.constantFrom('distributor', 'web_order', 'customer'), locationId: fc.constantFrom('1', '2'), orderId: pick(f.orderIds.map(String), '1'), reference: fc.constant('WEB-20931'), shipTo: fc.constant('8 Fen Lane, Ashby Mere'), carrier: fc.constant('Ridgeway Freight'), trackingNumber: fc.constantFrom('RF 2231 7781', 'ZX-99120'), serial: fc.subarray(some(f, 'packed'), { minLength: 1, maxLength: 2 }) })
			.map((b) => at('/shipments?/create', b))
});

/** The customer's own actions, behind a live status link. */
function trackAction(a: 'approve' | 'decline' | 'pay' | 'prefs', body: () => fc.Arbitrary<Record<string, unknown>>): FuzzTarget {
	return target({
		route: '/track/[token]',
		action: a,
		as: 'anon',
		encoding: 'form',
		offsite: a === 'pay',
		valid: (f) => fc.tuple(pick(tokensFor(f, a === 'prefs' ? null : a), 'not-a-valid-token-at-all'), body()).map(([t, b]) => at(`/track/${t}?/${a}`, b))
	});
}
const trackTargets = [
	trackAction('approve', () => fc.constant({})),
	trackAction('decline', () => fc.record({ choice: fc.constantFrom('return', 'scrap') })),
	trackAction('pay', () => fc.constant({})),
	trackAction('prefs', () => fc.record(Object.fromEntries(NOTICE_KINDS.map((k) => [k, fc.constantFrom('on', '')]))))
];

/** A checkout.session.completed event as the provider sends it. */
function eventFor(f: FuzzFixtures) {
	return fc.record({
		id: fc.uuid().map((u) => `evt_fuzz_${u.replace(/-/g, '')}`),
		object: fc.constant('event'),
		type: fc.constantFrom('checkout.session.completed', 'checkout.session.completed', 'payment_intent.succeeded'),
		created: fc.constant(Math.floor(Date.now() / 1000)),
		data: fc.record({
			object: fc.record({
				id: fc.constantFrom('cs_test_fuzz', 'cs_test_unknown'),
				object: fc.constant('checkout.session'),
				payment_status: fc.constantFrom('paid', 'unpaid'),
				amount_total: fc.constantFrom(10825, 0, 1),
				metadata: fc.record({ quoteId: fc.integer({ min: 1, max: 20 }).map(String), orderId: pick(f.liveOrderIds.map(String), '1') })
			})
		})
	});
}

/**
 * The payment webhook: well-signed bodies with hostile content (they reach the service), and
 * bodies altered after signing, which must be refused.
 */
const webhook: FuzzTarget = {
	route: '/api/payments/webhook',
	method: 'POST',
	as: 'anon',
	request: (f) => {
		const signed = requestsFrom('json', eventFor(f).map((e) => at('/api/payments/webhook', e))).map((r): FuzzRequest => {
			if (r.shape === 'hostile') return r;
			const payload = String(r.body);
			return { ...r, headers: { ...r.headers, 'stripe-signature': f.sign(payload) } };
		});
		const altered = fc.tuple(eventFor(f), fc.constantFrom('amount', 'space', 'byte', 'resign-other', 'unsigned', 'drop-v1', 'old')).map(([e, how]): FuzzRequest => {
			const payload = toJsonText(e);
			let body = payload;
			let sig = f.sign(payload);
			if (how === 'amount') body = payload.replace(/"amount_total":(\d+)/, (_, n) => `"amount_total":${Number(n) + 1}`);
			if (how === 'space') body = `${payload} `;
			if (how === 'byte') body = payload.replace('"paid"', '"pa1d"').replace('"event"', '"evEnt"');
			if (how === 'resign-other') sig = f.sign(`${payload}\n`);
			if (how === 'unsigned') sig = '';
			if (how === 'drop-v1') sig = sig.replace(/v1=[0-9a-f]+/, 'v1=');
			if (how === 'old') sig = sig.replace(/t=\d+/, 't=1000000000');
			if (body === payload && sig === f.sign(payload)) throw new Error(`the webhook alteration ${how} changed nothing`);
			return { path: '/api/payments/webhook', kind: 'raw', contentType: 'application/json', body, headers: sig ? { 'stripe-signature': sig } : {}, shape: `altered:${how}`, mustRefuse: 'a body changed after signing, or not signed with the secret, is refused' };
		});
		return fc.oneof({ weight: 3, arbitrary: signed }, { weight: 1, arbitrary: altered });
	}
};

export const FUZZ_TARGETS: FuzzTarget[] = [
	eventsTarget,
	stationScan,
	stationMove,
	inspectionTarget,
	undoTarget,
	balanceRecord,
	balanceBalanced,
	assemblyRecord,
	assemblyAssembled,
	balanceRunsApi,
	assemblyApi,
	usersCreate,
	usersRole,
	usersActive,
	usersLift,
	modelsSave,
	orderCreate,
	orderSettings,
	// the customer answers first, so that the office finds declined orders to scrap
	...trackTargets,
	...orderActions,
	shipmentCreate,
	webhook,
	lotsNew,
	lotsAdd,
	lotsPreview,
	lotsImport,
	suppliersCreate,
	suppliersUpdate,
	checklistCreate,
	checklistAdd,
	checklistToggle,
	floorAssign,
	floorOverdue,
	reasonsAdd,
	reasonsRename,
	reasonsToggle,
	...cardsTargets,
	cardsOrder,
	demandCreate,
	demandStatus,
	demandPreview,
	demandImport,
	planAlpha,
	planCard,
	labourRate,
	warrantyLink,
	warrantyVerdict,
	// sign-in last: its lock-outs must not meet the other targets' sessions
	login
];

/** Mutating routes left out of the fuzzing, each with the reason. */
export const NOT_FUZZED: Record<string, string> = {
	'/logout POST': 'takes no input but an `everywhere` flag; every body signs out (tests/server/sign-in.test.ts)'
};

// re-exported for the test's own checks
export { deepValue, encode, hostileJsonValue, hostileString };
