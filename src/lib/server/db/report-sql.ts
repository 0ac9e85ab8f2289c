/**
 * SQLite-only SQL fragments the reports use (JSON fields of events, calendar weeks). Kept here
 * so the report services stay portable Drizzle.
 */
import { sql, type SQL, type SQLWrapper } from 'drizzle-orm';

/*
 * Every JSON function is guarded by json_valid: the history is append-only, so a row that is not
 * JSON (or nests deeper than SQLite's JSON parser takes) stays for ever and must read as "missing",
 * never as an error ("malformed JSON") that takes the whole report down. CASE evaluates lazily.
 */

/** A numeric JSON field of a `data` column, 0 when missing, not a number, negative or the row is not JSON. */
export function jsonPositiveNumber(column: SQLWrapper, field: string): SQL<number> {
	const path = `$.${field}`;
	return sql<number>`(case when not json_valid(${column}) then 0 when json_type(${column}, ${path}) in ('integer', 'real') and json_extract(${column}, ${path}) > 0 then json_extract(${column}, ${path}) else 0 end)`;
}

/** A text JSON field of a `data` column, or null (also when the row is not JSON). */
export function jsonText(column: SQLWrapper, field: string): SQL<string | null> {
	const path = `$.${field}`;
	return sql<string | null>`(case when not json_valid(${column}) then null when json_type(${column}, ${path}) = 'text' then json_extract(${column}, ${path}) end)`;
}

/** The Monday (UTC, YYYY-MM-DD) of the week holding a millisecond timestamp column. */
export function weekOfMs(column: SQLWrapper): SQL<string> {
	// 'weekday 1' moves forward to the next Monday (or stays on one); minus 7 days when it moved.
	return sql<string>`date(${column} / 1000, 'unixepoch', '-6 days', 'weekday 1')`;
}

/** The time of the next event of the same unit (null for the latest): a window function. */
export function nextEventAt(unitId: SQLWrapper, seq: SQLWrapper, at: SQLWrapper): SQL<number | null> {
	return sql<number | null>`lead(${at}) over (partition by ${unitId} order by ${seq})`;
}
