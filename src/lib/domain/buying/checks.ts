/**
 * Small input checks for the buying decisions: counts are whole numbers ≥ 0, money and minutes
 * finite and ≥ 0. Each refusal is a RangeError whose message is a sentence a person can act on.
 */

export function checkCount(name: string, v: number): number {
	if (typeof v !== 'number' || !Number.isFinite(v)) throw new RangeError(`The ${name} must be a number, not ${String(v)}.`);
	if (v < 0) throw new RangeError(`The ${name} cannot be negative (got ${v}).`);
	if (!Number.isInteger(v)) throw new RangeError(`The ${name} must be a whole number (got ${v}).`);
	return v;
}

export function checkAmount(name: string, v: number): number {
	if (typeof v !== 'number' || !Number.isFinite(v)) throw new RangeError(`The ${name} must be a number, not ${String(v)}.`);
	if (v < 0) throw new RangeError(`The ${name} cannot be negative (got ${v}).`);
	return v;
}

/** Successes out of trials: both whole, ≥ 0, and no more successes than trials. */
export function checkProportion(what: string, x: number, n: number): void {
	checkCount(`count of ${what}`, x);
	checkCount(`number of cores judged`, n);
	if (x > n) throw new RangeError(`There cannot be more ${what} (${x}) than cores judged (${n}).`);
}

export function checkConfidence(c: number): number {
	if (typeof c !== 'number' || !Number.isFinite(c) || c <= 0 || c >= 1) throw new RangeError(`The confidence level must be between 0 and 1 (got ${String(c)}).`);
	return c;
}
