/**
 * Calendar weeks as ISO 8601 counts them: weeks start on Monday, and a week belongs to the
 * year its Thursday falls in. Dates are plain YYYY-MM-DD strings, computed in UTC so that a
 * date never shifts with the server's time zone.
 */

import { finite, nonNegativeInt } from '../numbers';

const DAY = 86_400_000;
/** pastWeeks looks back at most this many weeks (about twenty years). */
export const MAX_PAST_WEEKS = 1040;
const FIRST_MS = Date.parse('0000-01-01T00:00:00Z');
const LAST_MS = Date.parse('9999-12-31T00:00:00Z');

function toMs(date: string): number {
	const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
	if (!m) throw new RangeError(`The date ${JSON.stringify(String(date).slice(0, 40))} is not written YYYY-MM-DD.`);
	return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
}

function fromMs(ms: number): string {
	// Years 0000–9999 keep the YYYY-MM-DD form.
	if (!(ms >= FIRST_MS && ms <= LAST_MS)) throw new RangeError('That date is outside the years 0000 to 9999.');
	return new Date(ms).toISOString().slice(0, 10);
}

export function addDays(date: string, days: number): string {
	finite('The number of days', days);
	if (!Number.isInteger(days)) throw new RangeError(`Add a whole number of days (got ${days}).`);
	return fromMs(toMs(date) + days * DAY);
}

/** The Monday that starts the ISO week holding `date`. */
export function weekStart(date: string): string {
	const ms = toMs(date);
	const dow = (new Date(ms).getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
	return fromMs(ms - dow * DAY);
}

/** ISO week label, e.g. "2009-W53", and the weekday 1 (Monday) … 7 (Sunday). */
export function isoWeek(date: string): { year: number; week: number; day: number; label: string } {
	const ms = toMs(date);
	const day = ((new Date(ms).getUTCDay() + 6) % 7) + 1;
	const thursday = ms + (4 - day) * DAY;
	const year = new Date(thursday).getUTCFullYear();
	const week = Math.floor((thursday - Date.UTC(year, 0, 1)) / DAY / 7) + 1;
	return { year, week, day, label: `${year}-W${String(week).padStart(2, '0')}` };
}

/** Start dates of the `count` full weeks before the week holding `today`, oldest first. */
export function pastWeeks(today: string, count: number): string[] {
	nonNegativeInt('The number of weeks', count);
	if (count > MAX_PAST_WEEKS) throw new RangeError(`Look back at most ${MAX_PAST_WEEKS} weeks (got ${count}).`);
	const current = weekStart(today);
	return Array.from({ length: count }, (_, i) => addDays(current, -7 * (count - i)));
}

export function isDate(value: string): boolean {
	if (!/^\d{4}-\d{2}-\d{2}$/.test(value)) return false;
	return fromMs(toMs(value)) === value;
}
