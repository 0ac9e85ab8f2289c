/**
 * The one CSV writer (src/lib/csv/write.ts). Reference parser beside every round trip:
 * papaparse's `parse` (RFC 4180 reader), the same library the imports use.
 */
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, test } from 'vitest';
import { toCsv } from '../../src/lib/csv/write';

/** Read back with papaparse (strips the BOM itself; CRLF rows). */
const read = (text: string) => Papa.parse<string[]>(text, { delimiter: ',', newline: '\r\n', skipEmptyLines: false }).data;

describe('the shared CSV writer', () => {
	test('starts with a UTF-8 byte-order mark (U+FEFF, Unicode Standard §23.8) and ends every row with CRLF (RFC 4180 §2)', () => {
		const text = toCsv(['name', 'n'], [['Zoë Ångström', 1], ['Łukasz', 2]]);
		expect(text.startsWith('\uFEFF')).toBe(true);
		expect(text.slice(1)).toBe('name,n\r\nZoë Ångström,1\r\nŁukasz,2\r\n');
		expect(new TextEncoder().encode(text).slice(0, 3)).toEqual(new Uint8Array([0xef, 0xbb, 0xbf]));
		expect(toCsv(['a', 'b'], [])).toBe('\uFEFFa,b\r\n');
	});

	test('text that a spreadsheet would run as a formula gets a leading quote (OWASP "CSV Injection": = + - @ tab CR)', () => {
		const evil = ['=HYPERLINK("http://evil.example","Sup")', '+1+1', '-2+3', '@SUM(A1)', '\t=1', '\r=1', '=1+1\nsecond line'];
		const text = toCsv(['supplier'], evil.map((s) => [s]));
		const back = read(text);
		// papaparse reads each cell back as the quote-prefixed text, nothing else
		expect(back.slice(1, evil.length + 1).map((r) => r[0])).toEqual(evil.map((s) => `'${s}`));
		expect(text).toContain('"\'=HYPERLINK(""http://evil.example"",""Sup"")"');
		expect(text).not.toMatch(/(^|,|\n)=/);
	});

	test('numbers stay numbers: -5 is written as -5; the text "-5" is guarded', () => {
		const text = toCsv(['n', 'text', 'x'], [[-5, '-5', 2.5], [0, 'plain', -0.25]]);
		expect(text.slice(1).split('\r\n')).toEqual(['n,text,x', "-5,\"'-5\",2.5", '0,plain,-0.25', '']);
	});

	test('missing and non-finite values are empty cells', () => {
		expect(toCsv(['a', 'b', 'c', 'd'], [[null, undefined, Number.NaN, Number.POSITIVE_INFINITY]]).slice(1)).toBe('a,b,c,d\r\n,,,\r\n');
	});

	test('quotes, commas and line breaks inside cells round-trip through papaparse', () => {
		const rows = [['say "hi"', 'a,b'], ['two\nlines', 'cr\r\nlf'], [' padded ', '']];
		expect(read(toCsv(['h1', 'h2'], rows)).slice(1, 4)).toEqual(rows);
	});

	test('any text round-trips through papaparse, a formula-looking cell with its leading quote', () => {
		fc.assert(
			fc.property(fc.array(fc.array(fc.string({ maxLength: 12, unit: 'binary' }), { minLength: 2, maxLength: 2 }), { minLength: 1, maxLength: 5 }), (rows) => {
				const back = read(toCsv(['h1', 'h2'], rows));
				expect(back.slice(1, rows.length + 1)).toEqual(rows.map((r) => r.map((s) => (/^[=+\-@\t\r]/.test(s) ? `'${s}` : s))));
			}),
			{ numRuns: 300 }
		);
	});
});
