/**
 * Checks that a number means something before the arithmetic uses it. Each check returns the
 * number it was given, or throws a RangeError whose message is a plain sentence naming the
 * quantity, e.g. "Scrapped cores (12) cannot exceed cores judged (10)."
 *
 * `name` is the quantity as a person would say it at the start of a sentence ("Rotor mass",
 * "Cores judged"); `atMost` lower-cases the second name in the middle of its sentence.
 */

/** How a value is shown inside a message. */
export function shown(x: unknown): string {
	if (typeof x === 'number') {
		if (Number.isNaN(x)) return 'not a number';
		if (x === Infinity) return 'infinite';
		if (x === -Infinity) return 'minus infinite';
		return String(x);
	}
	if (x === null) return 'nothing';
	if (x === undefined) return 'missing';
	return `a ${typeof x}`;
}

/** A finite number (not NaN, not ±Infinity, not a string or anything else). */
export function finite(name: string, x: unknown): number {
	if (typeof x !== 'number' || !Number.isFinite(x)) throw new RangeError(`${name} must be a number (got ${shown(x)}).`);
	return x;
}

/** A finite number of 0 or more. */
export function nonNegative(name: string, x: unknown): number {
	finite(name, x);
	if ((x as number) < 0) throw new RangeError(`${name} cannot be negative (got ${shown(x)}).`);
	return x as number;
}

/** A finite number above 0. */
export function positive(name: string, x: unknown): number {
	finite(name, x);
	if (!((x as number) > 0)) throw new RangeError(`${name} must be more than 0 (got ${shown(x)}).`);
	return x as number;
}

/** A whole count of 0 or more that a double holds exactly (at most 2^53 − 1). */
export function nonNegativeInt(name: string, x: unknown): number {
	finite(name, x);
	if (!Number.isSafeInteger(x) || (x as number) < 0) throw new RangeError(`${name} must be a whole number of 0 or more (got ${shown(x)}).`);
	return x as number;
}

/** A whole count of 1 or more. */
export function positiveInt(name: string, x: unknown): number {
	nonNegativeInt(name, x);
	if ((x as number) < 1) throw new RangeError(`${name} must be at least 1 (got ${shown(x)}).`);
	return x as number;
}

/** A whole number (of either sign) that a double holds exactly. */
export function safeInt(name: string, x: unknown): number {
	finite(name, x);
	if (!Number.isSafeInteger(x)) throw new RangeError(`${name} must be a whole number (got ${shown(x)}).`);
	return x as number;
}

/** A finite number from `lo` to `hi`, both included. */
export function between(name: string, x: unknown, lo: number, hi: number): number {
	finite(name, x);
	if ((x as number) < lo || (x as number) > hi) throw new RangeError(`${name} must be from ${lo} to ${hi} (got ${shown(x)}).`);
	return x as number;
}

/** A share or a probability: 0 to 1. */
export function fraction(name: string, x: unknown): number {
	return between(name, x, 0, 1);
}

/** `part` may not be larger than `whole`: "Scrapped cores (12) cannot exceed cores judged (10)." */
export function atMost(partName: string, part: number, wholeName: string, whole: number): void {
	if (part > whole) throw new RangeError(`${partName} (${shown(part)}) cannot exceed ${lowerFirst(wholeName)} (${shown(whole)}).`);
}

/** An absolute pressure: above a full vacuum. */
export function absolutePressure(name: string, x: unknown, unit = 'kPa'): number {
	finite(name, x);
	if (!((x as number) > 0)) throw new RangeError(`${name} of ${shown(x)} ${unit} absolute is at or below a full vacuum.`);
	return x as number;
}

/** A result that overflowed (or came out NaN) from meaningful inputs is too large to work out. */
export function result(name: string, x: number): number {
	if (!Number.isFinite(x)) throw new RangeError(`${name} is too large to work out from these numbers.`);
	return x;
}

/** Every number in a computed result (nested objects and arrays too) is finite; null stands for "none". */
export function finiteResult<T>(name: string, value: T): T {
	const stack: unknown[] = [value];
	while (stack.length) {
		const v = stack.pop();
		if (typeof v === 'number') result(name, v);
		else if (Array.isArray(v)) stack.push(...v);
		else if (v && typeof v === 'object') stack.push(...Object.values(v));
	}
	return value;
}

/** One of a fixed set of words. */
export function oneOf<T extends string>(name: string, x: unknown, allowed: readonly T[]): T {
	if (typeof x !== 'string' || !(allowed as readonly string[]).includes(x)) {
		throw new RangeError(`${name} must be one of ${allowed.join(', ')} (got ${typeof x === 'string' ? JSON.stringify(x.slice(0, 40)) : shown(x)}).`);
	}
	return x as T;
}

/** An instant in milliseconds since the epoch that a Date can hold (±8.64e15 ms). */
export function instantMs(name: string, x: unknown): number {
	finite(name, x);
	if (Math.abs(x as number) > 8.64e15) throw new RangeError(`${name} is not a date a calendar can hold (got ${shown(x)}).`);
	return x as number;
}

/** The milliseconds of a date given as a Date, an ISO string or a number. */
export function timeOf(name: string, t: unknown): number {
	const ms = t instanceof Date ? t.getTime() : typeof t === 'number' ? t : typeof t === 'string' ? Date.parse(t) : NaN;
	if (!Number.isFinite(ms)) throw new RangeError(`${name} is not a valid date and time.`);
	return instantMs(name, ms);
}

/** A list, not something else. */
export function list<T>(name: string, xs: unknown): readonly T[] {
	if (!Array.isArray(xs)) throw new RangeError(`${name} must be a list (got ${shown(xs)}).`);
	return xs as readonly T[];
}

function lowerFirst(s: string): string {
	return s && /^[A-Z][a-z]/.test(s) ? s[0].toLowerCase() + s.slice(1) : s;
}
