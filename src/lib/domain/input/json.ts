/**
 * JSON text from outside (a request body) or from storage (a column written by any version of the
 * app) is checked before it is parsed: how deep it nests is counted on the raw text, without
 * recursion, so a hostile `[[[[…]]]]` is refused before `JSON.parse`, a schema or a serialiser
 * (all recursive) ever sees it.
 */

/** The deepest nesting any body or stored column of the shop needs is a handful of levels; 32 leaves room. */
export const MAX_JSON_DEPTH = 32;

/**
 * The deepest nesting of objects and arrays in a JSON text, counted up to `stop` (the count stops
 * there: the answer is then `stop`). Brackets inside strings do not count. Linear, no recursion.
 */
export function jsonDepth(text: string, stop = Number.POSITIVE_INFINITY): number {
	let depth = 0;
	let deepest = 0;
	let inString = false;
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (inString) {
			if (c === 0x5c /* \ */) i++;
			else if (c === 0x22 /* " */) inString = false;
			continue;
		}
		if (c === 0x22) inString = true;
		else if (c === 0x7b /* { */ || c === 0x5b /* [ */) {
			depth++;
			if (depth > deepest) {
				deepest = depth;
				if (deepest >= stop) return stop;
			}
		} else if (c === 0x7d /* } */ || c === 0x5d /* ] */) depth--;
	}
	return deepest;
}

/** The sentence for a body that nests too deep. */
export function tooDeepMessage(max = MAX_JSON_DEPTH): string {
	return `The body nests deeper than ${max} levels of objects and arrays; send a flatter body.`;
}

export type JsonParse = { ok: true; value: unknown } | { ok: false; reason: 'too_deep' | 'invalid' };

/** Parse JSON text whose nesting is first checked against `maxDepth`; never throws. */
export function parseJsonBounded(text: string, maxDepth = MAX_JSON_DEPTH): JsonParse {
	if (jsonDepth(text, maxDepth + 1) > maxDepth) return { ok: false, reason: 'too_deep' };
	try {
		return { ok: true, value: JSON.parse(text) };
	} catch {
		return { ok: false, reason: 'invalid' };
	}
}

/** What stands in for a value nested deeper than a reader keeps (see `pruneDepth`). */
export const TOO_DEEP = '[nested too deep]';

/**
 * A copy of a parsed value with everything nested deeper than `maxDepth` replaced by `TOO_DEEP`,
 * so that recursive code (serialisers, schemas) can handle it. Recursion stops at `maxDepth`.
 */
export function pruneDepth(value: unknown, maxDepth = MAX_JSON_DEPTH): unknown {
	if (value === null || typeof value !== 'object') return value;
	if (maxDepth <= 0) return TOO_DEEP;
	if (Array.isArray(value)) return value.map((v) => pruneDepth(v, maxDepth - 1));
	const out: Record<string, unknown> = Object.create(null);
	for (const [k, v] of Object.entries(value)) out[k] = pruneDepth(v, maxDepth - 1);
	return out;
}

/**
 * Parse JSON text that was stored earlier and must be read whatever it holds: never throws
 * (`JSON.parse` in V8 is not recursive), and the value comes back pruned to `maxDepth`.
 */
export function parseStoredJson(text: string, maxDepth = MAX_JSON_DEPTH): { ok: true; value: unknown; pruned: boolean } | { ok: false } {
	let value: unknown;
	try {
		value = JSON.parse(text);
	} catch {
		return { ok: false };
	}
	const pruned = jsonDepth(text, maxDepth + 1) > maxDepth;
	return { ok: true, value: pruned ? pruneDepth(value, maxDepth) : value, pruned };
}

/** At most `max` characters of a text, with an ellipsis when cut (never splits a surrogate pair). */
export function clip(text: string, max: number): string {
	if (text.length <= max) return text;
	let end = max - 1;
	const c = text.charCodeAt(end - 1);
	if (c >= 0xd800 && c <= 0xdbff) end--;
	return `${text.slice(0, end)}…`;
}

/**
 * A short plain-text account of a value, at most `max` characters: JSON for values whose nesting
 * is bounded (as every parsed value of `parseJsonBounded` is), cut to length.
 */
export function summariseValue(value: unknown, max = 300): string {
	let text: string;
	try {
		text = typeof value === 'string' ? JSON.stringify(value) : (JSON.stringify(value) ?? String(value));
	} catch {
		text = String(value);
	}
	return clip(text, max);
}
