/**
 * Building blocks for the schemas of every write: numbers that refuse a blank field, objects that
 * refuse keys they do not declare. One place, so that every form and JSON body says the same
 * sentences.
 */
import { z } from 'zod';

/** A decimal number as people type it: 12, -3.5, .25, 1e3 (no hex, no "Infinity", no thousands separators). */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?$/i;

/** Blank means "nothing was entered": missing, null, or text that is empty or only spaces. */
export function isBlank(v: unknown): boolean {
	return v === undefined || v === null || (typeof v === 'string' && v.trim() === '');
}

/** Text that spells a decimal becomes that number; blanks become undefined; anything else stays as it is (and fails). */
function toNumberInput(v: unknown): unknown {
	if (isBlank(v)) return undefined;
	if (typeof v === 'string') {
		const t = v.trim();
		return DECIMAL.test(t) ? Number(t) : t;
	}
	return v;
}

export interface NumberRules {
	/** The sentence for a blank field; default "<label>: enter a number." */
	blank?: string;
	/** The sentence for text that is not a number; default "<label>: enter a number, e.g. 12 or 0.5." */
	notNumber?: string;
	min?: number;
	max?: number;
	/** The value must be below `max`, not equal to it (angles: 0 to under 360). */
	belowMax?: boolean;
	/** The sentence when outside min..max; default "<label>: from <min> to <max>." */
	range?: string;
	int?: boolean;
	/** The sentence for a fraction where whole numbers are needed; default "<label>: a whole number." */
	whole?: string;
}

function numberSchema(label: string, rules: NumberRules) {
	const blank = rules.blank ?? `${label}: enter a number.`;
	const notNumber = rules.notNumber ?? `${label}: enter a number, e.g. 12 or 0.5.`;
	const lo = rules.min ?? -Number.MAX_VALUE;
	const hi = rules.max ?? Number.MAX_VALUE;
	const range =
		rules.range ??
		(rules.min !== undefined && rules.max !== undefined
			? `${label}: from ${rules.min} to ${rules.max}.`
			: rules.min !== undefined
				? `${label}: ${rules.min} or more.`
				: `${label}: ${rules.max} or less.`);
	let n = z
		.number({ error: (iss) => (iss.input === undefined ? blank : notNumber) })
		.refine((v) => v >= lo && (rules.belowMax ? v < hi : v <= hi), range);
	if (rules.int) n = n.refine(Number.isInteger, rules.whole ?? `${label}: a whole number.`);
	return n;
}

/**
 * A number that must be entered: a blank field or null is refused with a sentence naming the
 * field ("0" typed on purpose is a reading). Accepts a number or the text of a decimal number.
 */
export function requiredNumber(label: string, rules: NumberRules = {}) {
	return z.preprocess(toNumberInput, numberSchema(label, rules));
}

/** A number that may be left out: blank or null is null; anything entered must be a number within the rules. */
export function optionalNumber(label: string, rules: Omit<NumberRules, 'blank'> = {}) {
	return z.preprocess(toNumberInput, numberSchema(label, rules).optional()).transform((v) => (v === undefined ? null : v));
}

/** The sentence for keys an object does not declare; names each of them. */
export function unknownKeysMessage(keys: readonly string[], what = 'This'): string {
	const shown = keys.slice(0, 5).map((k) => `"${k.length > 40 ? `${k.slice(0, 40)}…` : k}"`);
	const more = keys.length > 5 ? ` and ${keys.length - 5} more` : '';
	return keys.length === 1
		? `${what} does not take the field ${shown[0]}; remove it.`
		: `${what} does not take the fields ${shown.join(', ')}${more}; remove them.`;
}

/**
 * An object that refuses any key it does not declare, with a sentence naming the key.
 * `what` names the object in that sentence ("The hold", "A balance run").
 */
export function strictObject<S extends z.ZodRawShape>(shape: S, what = 'This'): z.ZodObject<S, z.core.$strict> {
	return z.strictObject(shape, {
		error: (iss) => (iss.code === 'unrecognized_keys' ? unknownKeysMessage(iss.keys, what) : undefined)
	});
}
