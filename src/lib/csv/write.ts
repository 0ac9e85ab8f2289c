/**
 * The one CSV writer for every export, in the browser and on the server.
 *
 * Built on papaparse's `unparse` (RFC 4180: CRLF line ends; a field with a comma, quote or
 * line break quoted, quotes doubled). The text starts with a UTF-8 byte-order mark so a
 * spreadsheet opened by double-click reads accented names right. A *text* cell that starts
 * with = + - @ tab or carriage return is written with a leading single quote (and quoted), so
 * a spreadsheet shows it as text instead of running it as a formula (OWASP "CSV Injection").
 * Numbers are written as numbers: -5 stays -5; NaN and ±Infinity are written as empty cells.
 */
import Papa from 'papaparse';

export type CsvCell = string | number | boolean | null | undefined;

export const CSV_CONTENT_TYPE = 'text/csv; charset=utf-8';
export const CSV_BOM = '\uFEFF';
/**
 * Text that a spreadsheet may take for a formula. papaparse's own default pattern ends in `.*$`
 * without the `s` flag, so it misses a cell with a line break in it (`=1+1\nx`); this one looks
 * at the first character only.
 */
export const FORMULA_START = /^[=+\-@\t\r]/;

function cell(v: CsvCell): string | number | boolean {
	if (v === null || v === undefined) return '';
	if (typeof v === 'number') return Number.isFinite(v) ? v : '';
	return v;
}

/** A header row and data rows as CSV text: BOM, CRLF after every row. */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
	const table = [header.map(String), ...rows.map((r) => header.map((_, i) => cell(r[i])))];
	const body = Papa.unparse(table, { escapeFormulae: FORMULA_START, newline: '\r\n', quotes: false });
	return CSV_BOM + body + '\r\n';
}

/** A download file name: letters, digits, dot, dash and underscore only, ending in .csv. */
export function csvFilename(name: string): string {
	const base = name.replace(/\.csv$/i, '').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[-.]+|-+$/g, '') || 'export';
	return `${base}.csv`;
}

/** A server answer carrying CSV text as a download. */
export function csvResponse(csv: string, filename: string): Response {
	return new Response(csv, {
		headers: {
			'content-type': CSV_CONTENT_TYPE,
			'content-disposition': `attachment; filename="${csvFilename(filename)}"`,
			'cache-control': 'private, no-store'
		}
	});
}
