/** Shop serials: "SY-" and at least five digits, printed on the traveler. */

export const SERIAL_PATTERN = /^SY-\d{5,7}$/;

export function formatSerial(n: number): string {
	if (typeof n !== 'number' || !Number.isInteger(n) || n < 1 || n > 9_999_999) throw new RangeError(`A serial number is a whole number from 1 to 9,999,999 (got ${String(n)}).`);
	return `SY-${String(n).padStart(5, '0')}`;
}

/** Accepts what a scanner or a person types: case, spaces and a missing dash are forgiven. */
export function normalizeSerial(input: string): string | null {
	const compact = input.trim().toUpperCase().replace(/\s+/g, '');
	const m = /^SY-?(\d{1,7})$/.exec(compact);
	if (!m) return null;
	const n = Number(m[1]);
	return n >= 1 ? formatSerial(n) : null;
}

export function isSerial(value: string): boolean {
	return SERIAL_PATTERN.test(value);
}
