/**
 * The fuzzer's hostile vocabulary and the generator that turns a target's valid requests into
 * hostile ones: valid first, then one field broken at a time (a hostile value, a blank, a wrong
 * type, a deep nest, a huge string, removed or doubled), unknown keys added at any level, and
 * bodies no client would send.
 *
 * Deep nesting is never built as a JavaScript object (JSON.stringify and the test's own
 * recursion would overflow first): a value stands in as a marker string and the JSON text
 * around it is spliced with `deepJson`, a loop.
 */
import fc from 'fast-check';

export const FRAGMENTS = [
	"' OR '1'='1",
	"'; DROP TABLE unit_event; --",
	"1; UPDATE unit SET state = 'shipped'",
	'" UNION SELECT password_hash FROM user --',
	'<script>alert(1)</script>',
	'"><img src=x onerror=alert(1)>',
	'javascript:alert(1)',
	'=HYPERLINK("http://evil.example","x")',
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
	'null',
	'undefined',
	'true',
	'[]',
	'{}',
	' ',
	''
];

/** Numbers as a form or a careless client writes them: blank, not-a-number, infinite, odd digits. */
export const NUMBER_TEXTS = ['', ' ', 'NaN', 'nan', 'Infinity', '-Infinity', '1e309', '-1e309', '-0', '0x1F', '1_000', '1,5', '１２', '١٢', '12abc', '٫5', '1e-400', '9007199254740993', '-1', '0'];

/** Unicode that trips careless code: direction marks, joiners, lone surrogates, combining marks, BOM, NUL. */
export const UNICODE_ODDITIES = [
	'\u202e\u202dRTL',
	'\ufeffBOM',
	'zero\u200bwidth\u200djoin',
	'a\u0301\u0301\u0301\u0301',
	'\ud800',
	'\udfff\ud800',
	'\u0000nul',
	'line\u2028sep\u2029',
	'𝕊𝕐-𝟘𝟘𝟘𝟘𝟙',
	'👩🏽‍🔧🔩',
	'Z̸̡̢͎a̵̛͚l̷g̴o',
	'\u00a0\u3000',
	'İı',
	'\r\n\t'
];

export const hostileString: fc.Arbitrary<string> = fc.oneof(
	{ weight: 3, arbitrary: fc.constantFrom(...FRAGMENTS) },
	{ weight: 2, arbitrary: fc.constantFrom(...NUMBER_TEXTS) },
	{ weight: 2, arbitrary: fc.constantFrom(...UNICODE_ODDITIES) },
	{ weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'grapheme', maxLength: 40 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 20 }) },
	{ weight: 1, arbitrary: fc.constantFrom('x'.repeat(5000), 'é'.repeat(20_000), 'A'.repeat(70_000)) }
);

export const hostileNumber: fc.Arbitrary<number> = fc.oneof(
	fc.constantFrom(-1, 0, -0, 1.5, Number.MAX_SAFE_INTEGER, Number.MIN_SAFE_INTEGER, 2 ** 63, 1e308, 5e-324),
	fc.integer(),
	fc.double({ noNaN: true, noDefaultInfinity: true })
);

// ---- deep nesting, without recursion ----

const DEEP = /"@@deep:(\d+):([aom])@@"/g;

/** A marker that `spliceDeep` replaces with `levels` levels of arrays (a), objects (o) or both (m). */
export function deepMarker(levels: number, kind: 'a' | 'o' | 'm'): string {
	return `@@deep:${levels}:${kind}@@`;
}

/** JSON text nested `levels` deep, built by a loop. */
export function deepJson(levels: number, kind: 'a' | 'o' | 'm'): string {
	const open: string[] = [];
	const close: string[] = [];
	for (let i = 0; i < levels; i++) {
		const arr = kind === 'a' || (kind === 'm' && i % 2 === 0);
		open.push(arr ? '[' : '{"x":');
		close.push(arr ? ']' : '}');
	}
	return open.join('') + '1' + close.reverse().join('');
}

/** JSON.stringify, then every deep marker replaced by its nest. */
export function toJsonText(value: unknown): string {
	return (JSON.stringify(value) ?? 'null').replace(DEEP, (_, n, k) => deepJson(Number(n), k));
}

/** The same marker in a form field: the nest as text, as a client might paste it. */
export function spliceDeepText(text: string): string {
	return text.replace(/@@deep:(\d+):([aom])@@/g, (_, n, k) => deepJson(Number(n), k));
}

export const deepValue: fc.Arbitrary<string> = fc
	.tuple(fc.constantFrom(1000, 1500, 2000, 2500, 3000, 3500, 4000, 5000, 8000, 10_000), fc.constantFrom('a' as const, 'o' as const, 'm' as const))
	.map(([n, k]) => deepMarker(n, k));

const MB = 'x'.repeat(1024 * 1024);
const hugeString = fc.constantFrom('y'.repeat(30_000), 'é'.repeat(20_000), MB);

/** A hostile value for a JSON field: blanks, number-likes, wrong types, deep nests, huge strings, oddities. */
export const hostileJsonValue: fc.Arbitrary<unknown> = fc.oneof(
	{ weight: 3, arbitrary: fc.constantFrom<unknown>('', null, ' ', 'NaN', 'Infinity', '-Infinity', '1e309', true, false, 0, -1, [], {}) },
	{ weight: 3, arbitrary: hostileString },
	{ weight: 2, arbitrary: hostileNumber },
	{ weight: 2, arbitrary: deepValue },
	{ weight: 1, arbitrary: hugeString },
	{ weight: 1, arbitrary: fc.array(hostileString, { maxLength: 3 }) },
	{ weight: 1, arbitrary: fc.dictionary(hostileString.map((s) => s.slice(0, 30)), hostileString, { maxKeys: 3 }) }
);

/** A hostile value for a form field (everything is text there). */
export const hostileFormValue: fc.Arbitrary<string> = fc.oneof(
	{ weight: 3, arbitrary: fc.constantFrom(...NUMBER_TEXTS) },
	{ weight: 3, arbitrary: hostileString },
	{ weight: 1, arbitrary: deepValue },
	{ weight: 1, arbitrary: fc.constantFrom('y'.repeat(30_000), MB) }
);

/** Names of keys nobody declared. */
export const unknownKey: fc.Arbitrary<string> = fc.oneof(
	fc.constantFrom('x', 'extra', '__proto__', 'constructor', 'prototype', 'toString', 'admin', 'role', 'id', 'state', 'seq', 'version', '', ' ', '$where', 'a.b', 'data'),
	hostileString.map((s) => s.slice(0, 40))
);

// ---- requests ----

export type Encoding = 'form' | 'json' | 'multipart';

/** A multipart part: a text field or a file. */
export type Part = { name: string; value: string } | { name: string; filename: string; type: string; bytes: Buffer };

export interface FuzzRequest {
	path: string;
	/** 'form' posts as an enhanced form (JSON answer); 'raw' sends body and content-type as given. */
	kind: 'form' | 'raw';
	method?: string;
	fields?: [string, string][];
	contentType?: string;
	body?: string | Buffer;
	headers?: Record<string, string>;
	/** What the request is: valid, broken:<field>, blank:<field>, extra, hostile, altered. */
	shape: string;
	/** The server must refuse it (a body changed after it was signed). */
	mustRefuse?: string;
}

/** One valid request of a target: where it goes and what it carries. */
export interface Valid {
	path: string;
	body: Record<string, unknown>;
	headers?: Record<string, string>;
	method?: string;
}

function clone<T>(v: T): T {
	return v === undefined ? v : structuredClone(v);
}

/** Every path into plain objects and arrays of a body (iteratively), with the container at each. */
function paths(body: unknown): (string | number)[][] {
	const out: (string | number)[][] = [];
	const stack: { v: unknown; p: (string | number)[] }[] = [{ v: body, p: [] }];
	while (stack.length) {
		const { v, p } = stack.pop()!;
		if (p.length) out.push(p);
		if (Array.isArray(v)) v.forEach((x, i) => stack.push({ v: x, p: [...p, i] }));
		else if (v && typeof v === 'object' && !ArrayBuffer.isView(v)) for (const [k, x] of Object.entries(v)) stack.push({ v: x, p: [...p, k] });
	}
	return out.sort((a, b) => a.join('.').localeCompare(b.join('.')));
}

function objectsIn(body: unknown): Record<string, unknown>[] {
	const out: Record<string, unknown>[] = [];
	const stack = [body];
	while (stack.length) {
		const v = stack.pop();
		if (Array.isArray(v)) stack.push(...v);
		else if (v && typeof v === 'object' && !ArrayBuffer.isView(v)) {
			out.push(v as Record<string, unknown>);
			stack.push(...Object.values(v));
		}
	}
	return out;
}

function setAt(body: Record<string, unknown>, p: (string | number)[], value: unknown, remove: boolean) {
	let at: any = body; // eslint-disable-line @typescript-eslint/no-explicit-any
	for (const k of p.slice(0, -1)) at = at[k];
	const last = p[p.length - 1];
	if (remove) {
		if (Array.isArray(at)) at.splice(Number(last), 1);
		else delete at[last];
	} else Object.defineProperty(at, last, { value, enumerable: true, writable: true, configurable: true });
}

const key = fc.uuid().map((u) => `fuzz-${u}`);
export { key as idempotencyKey };

function encodeForm(v: Valid, shape: string, extra: [string, string][] = []): FuzzRequest {
	const fields: [string, string][] = [];
	for (const [k, x] of Object.entries(v.body)) {
		if (x === undefined) continue;
		for (const one of Array.isArray(x) ? x : [x]) fields.push([k, spliceDeepText(String(one))]);
	}
	return { path: v.path, kind: 'form', fields: [...fields, ...extra], headers: v.headers, shape };
}

function encodeJson(v: Valid, shape: string): FuzzRequest {
	return { path: v.path, kind: 'raw', method: v.method, contentType: 'application/json', body: toJsonText(v.body), headers: v.headers, shape };
}

const BOUNDARY = '----spoolyard-fuzz-7MA4YWxkTrZu0gW';

/** A multipart body from parts; `raw` text is spliced in verbatim (for broken bodies). */
export function multipartBody(parts: Part[], boundary = BOUNDARY): Buffer {
	const chunks: Buffer[] = [];
	for (const p of parts) {
		const safe = (s: string) => s.replace(/[\r\n"]/g, (c) => encodeURIComponent(c));
		if ('bytes' in p) {
			chunks.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${safe(p.name)}"; filename="${safe(p.filename)}"\r\nContent-Type: ${p.type}\r\n\r\n`));
			chunks.push(p.bytes, Buffer.from('\r\n'));
		} else {
			chunks.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${safe(p.name)}"\r\n\r\n${spliceDeepText(p.value)}\r\n`));
		}
	}
	chunks.push(Buffer.from(`--${boundary}--\r\n`));
	return Buffer.concat(chunks);
}

function encodeMultipart(v: Valid, shape: string): FuzzRequest {
	const parts: Part[] = [];
	for (const [k, x] of Object.entries(v.body)) {
		if (x === undefined) continue;
		for (const one of Array.isArray(x) ? x : [x]) {
			if (one && typeof one === 'object' && 'bytes' in (one as object)) parts.push({ ...(one as Part), name: k });
			else parts.push({ name: k, value: String(one) });
		}
	}
	return { path: v.path, kind: 'raw', contentType: `multipart/form-data; boundary=${BOUNDARY}`, body: multipartBody(parts), headers: v.headers, shape };
}

export function encode(encoding: Encoding, v: Valid, shape: string): FuzzRequest {
	return encoding === 'form' ? encodeForm(v, shape) : encoding === 'json' ? encodeJson(v, shape) : encodeMultipart(v, shape);
}

/** Bodies no client of the route would send: wrong content types, junk, a bare deep nest, a top-level array. */
function hostileRaw(path: fc.Arbitrary<string>, method?: string): fc.Arbitrary<FuzzRequest> {
	const body = fc.oneof(
		hostileString,
		fc.jsonValue().map((v) => JSON.stringify(v)),
		deepValue.map((m) => toJsonText(m)),
		fc.constantFrom('{"a":'.repeat(5000), '[', '{"__proto__":{"admin":true}}', '{"action":"hold","expectedVersion":NaN}', 'a=1&a=2&b=%ZZ', `--x\r\nContent-Disposition: form-data; name="a"\r\n\r\n1\r\n`)
	);
	const contentType = fc.constantFrom('application/json', 'text/plain', 'multipart/form-data; boundary=x', 'multipart/form-data', 'application/x-www-form-urlencoded', 'application/xml', '');
	return fc.tuple(path, contentType, body).map(([p, ct, b]): FuzzRequest => ({ path: p, kind: 'raw', method, contentType: ct, body: b, shape: 'hostile' }));
}

/**
 * The requests for a target: valid ones (a share reaches the service and is accepted), one field
 * broken at a time, unknown keys anywhere in the body, and hostile raw bodies.
 */
export function requestsFrom(encoding: Encoding, valid: fc.Arbitrary<Valid>, method?: string): fc.Arbitrary<FuzzRequest> {
	const breaker = encoding === 'json' ? hostileJsonValue : hostileFormValue;
	const broken = fc.tuple(valid, fc.nat(), breaker, fc.constantFrom('replace', 'replace', 'replace', 'blank', 'remove', 'double')).map(([v, n, bad, how]) => {
		const body = clone(v.body);
		const all = encoding === 'json' ? paths(body) : Object.keys(body).map((k) => [k]);
		if (!all.length) return encode(encoding, { ...v, body }, 'valid');
		const p = all[n % all.length];
		const name = p.join('.');
		if (how === 'remove') {
			setAt(body, p, undefined, true);
			return encode(encoding, { ...v, body }, `removed:${name}`);
		}
		if (how === 'blank') {
			setAt(body, p, encoding === 'json' && n % 2 ? null : '', false);
			return encode(encoding, { ...v, body }, `blank:${name}`);
		}
		if (how === 'double' && encoding !== 'json') {
			const now = body[p[0]];
			setAt(body, p, [...(Array.isArray(now) ? now : [now]), bad], false);
			return encode(encoding, { ...v, body }, `doubled:${name}`);
		}
		setAt(body, p, bad, false);
		return encode(encoding, { ...v, body }, `broken:${name}`);
	});
	const extraValue = fc.oneof({ weight: 1, arbitrary: breaker }, { weight: 2, arbitrary: deepValue });
	const extra = fc.tuple(valid, fc.nat(), fc.array(fc.tuple(unknownKey, extraValue), { minLength: 1, maxLength: 3 })).map(([v, n, adds]) => {
		const body = clone(v.body);
		if (encoding === 'json') {
			// a nested object (a move's data, a run's readings) twice as often as the top level
			const nested = objectsIn(body).filter((o) => o !== body);
			const at = nested.length && n % 3 ? nested[n % nested.length] : body;
			for (const [k, x] of adds) if (!(k in at)) Object.defineProperty(at, k, { value: x, enumerable: true, writable: true, configurable: true });
			return encode(encoding, { ...v, body }, 'extra');
		}
		for (const [k, x] of adds) if (!(k in body)) body[k] = x;
		return encode(encoding, { ...v, body }, 'extra');
	});
	return fc.oneof(
		{ weight: 3, arbitrary: valid.map((v) => encode(encoding, v, 'valid')) },
		{ weight: 5, arbitrary: broken },
		{ weight: 3, arbitrary: extra },
		{ weight: 1, arbitrary: hostileRaw(valid.map((v) => v.path), method) }
	);
}

/** The deep-nesting ladder: levels every run tries, whatever the seed (the range where stored nests have broken pages). */
export const LADDER = [1000, 2000, 2500, 3000, 3500, 4000, 5000, 10_000];

/**
 * One request per ladder step, each from a valid request with a nest put under an unknown key of
 * its innermost object (a move's data, a run's record) or, for forms, as an extra field.
 */
export function deepLadder(encoding: Encoding, valids: Valid[]): FuzzRequest[] {
	return LADDER.map((levels, i) => {
		const v = valids[i % valids.length];
		const body = clone(v.body);
		const marker = deepMarker(levels, i % 2 ? 'o' : 'a');
		if (encoding === 'json') {
			const nested = objectsIn(body).filter((o) => o !== body);
			(nested[nested.length - 1] ?? body).extra = marker;
		} else body.extra = marker;
		return encode(encoding, { ...v, body }, `deep:${levels}`);
	});
}
