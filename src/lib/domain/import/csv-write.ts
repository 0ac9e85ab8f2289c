/**
 * Writing CSV for reports (RFC 4180: CRLF line ends, fields with comma, quote or line break
 * quoted, quotes doubled). A cell that starts with = + - @ or a tab is prefixed with a
 * single quote so a spreadsheet shows it as text instead of running it as a formula.
 */
const NEEDS_QUOTES = /[",\r\n]/;
const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(value: string | number | boolean | null | undefined): string {
	if (value === null || value === undefined) return '';
	if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
	let s = String(value);
	if (FORMULA_START.test(s)) s = `'${s}`;
	return NEEDS_QUOTES.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function toCsv(header: readonly string[], rows: readonly (readonly (string | number | boolean | null | undefined)[])[]): string {
	return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
