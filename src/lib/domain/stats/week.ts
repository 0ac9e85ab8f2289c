import { instantMs } from '../numbers';

const FIRST_MS = Date.parse('0000-01-03T00:00:00Z'); // the first Monday of year 0000
const END_MS = Date.parse('+010000-01-01T00:00:00Z');

/** Weeks start on Monday (ISO 8601); a week is named by the UTC date of its Monday, YYYY-MM-DD. */
export function weekStart(atMs: number): string {
	instantMs('The instant', atMs);
	if (atMs < FIRST_MS || atMs >= END_MS) throw new RangeError('That instant is outside the years 0000 to 9999.');
	const d = new Date(atMs);
	const day = (d.getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
	const monday = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate() - day);
	return new Date(monday).toISOString().slice(0, 10);
}
