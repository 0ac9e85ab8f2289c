import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, test } from 'vitest';
import { decodeCsvBytes, firstInvalidUtf8, parseCsvTable, readCsvTable, MAX_IMPORT_ROWS } from '../../src/lib/domain/import/csv-table';
import { toCsv } from '../../src/lib/csv/write';
import { applyColumnMap, checkColumnMap, guessColumnMap, normalizeHeader, type ImportField } from '../../src/lib/domain/import/map-columns';

const enc = (s: string) => new TextEncoder().encode(s);

describe('reading the bytes', () => {
	test('empty file', () => {
		const r = decodeCsvBytes(new Uint8Array());
		expect(r).toEqual({ ok: false, message: expect.stringContaining('empty') });
	});

	test('a UTF-8 byte-order mark (EF BB BF, Unicode Standard §23.8) is dropped', () => {
		const r = decodeCsvBytes(new Uint8Array([0xef, 0xbb, 0xbf, ...enc('Tag,Model\n')]));
		expect(r).toEqual({ ok: true, value: 'Tag,Model\n' });
	});

	test('UTF-16 with a byte-order mark (FF FE little-endian, FE FF big-endian) is refused with a way out', () => {
		const le = new Uint8Array([0xff, 0xfe, 0x54, 0x00, 0x61, 0x00, 0x67, 0x00]);
		const be = new Uint8Array([0xfe, 0xff, 0x00, 0x54, 0x00, 0x61, 0x00, 0x67]);
		for (const b of [le, be]) {
			expect(decodeCsvBytes(b)).toEqual({ ok: false, message: expect.stringMatching(/UTF-16.*CSV UTF-8/) });
		}
	});

	test('UTF-16 without a mark is recognised by its NUL bytes', () => {
		const bytes = new Uint8Array([...'Tag,Model\r\n'].flatMap((c) => [c.charCodeAt(0), 0]));
		expect(decodeCsvBytes(bytes)).toEqual({ ok: false, message: expect.stringContaining('UTF-16') });
	});

	test('Latin-1 bytes are refused with the line they are on', () => {
		// "Café" in ISO/IEC 8859-1 is 43 61 66 E9; E9 followed by a newline is not UTF-8 (RFC 3629 §4).
		const bytes = new Uint8Array([...enc('Tag,Model,Notes\nAX-1,CH-F46,Caf'), 0xe9, ...enc('\n')]);
		expect(decodeCsvBytes(bytes)).toEqual({ ok: false, message: expect.stringMatching(/not UTF-8.*line 2/) });
	});

	test('firstInvalidUtf8 agrees with the WHATWG decoder in Node (fatal mode) on random bytes', () => {
		fc.assert(
			fc.property(fc.uint8Array({ maxLength: 40 }), (bytes) => {
				let valid = true;
				try {
					new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
				} catch {
					valid = false;
				}
				expect(firstInvalidUtf8(bytes) === -1).toBe(valid);
			}),
			{ numRuns: 3000 }
		);
	});

	test('firstInvalidUtf8 on the Unicode Standard Table 3-7 edge cases', () => {
		expect(firstInvalidUtf8(new Uint8Array([0xc0, 0xaf]))).toBe(0); // overlong "/"
		expect(firstInvalidUtf8(new Uint8Array([0xed, 0xa0, 0x80]))).toBe(0); // surrogate U+D800
		expect(firstInvalidUtf8(new Uint8Array([0xf4, 0x90, 0x80, 0x80]))).toBe(0); // above U+10FFFF
		expect(firstInvalidUtf8(new Uint8Array([0x41, 0xe2, 0x82, 0xac]))).toBe(-1); // "A€"
		expect(firstInvalidUtf8(new Uint8Array([0x41, 0xe2, 0x82]))).toBe(1); // cut short
	});
});

describe('parsing the table', () => {
	test('header only', () => {
		const r = parseCsvTable('Tag,Model,Notes\r\n');
		expect(r).toEqual({ ok: false, message: expect.stringContaining('header row but no data rows') });
	});

	test('blank text is an empty file', () => {
		expect(parseCsvTable('\r\n\r\n  \n').ok).toBe(false);
	});

	test('RFC 4180 §2 quoting: doubled quotes, commas and line breaks inside quotes', () => {
		const r = parseCsvTable('a,b,c\r\n"aaa","b""bb","ccc"\r\n"x,y","line1\nline2",z\r\n');
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.value.rows.map((x) => x.cells)).toEqual([
			['aaa', 'b"bb', 'ccc'],
			['x,y', 'line1\nline2', 'z']
		]);
	});

	test('semicolon files (spreadsheets in decimal-comma locales) are read too', () => {
		const r = parseCsvTable('Tag;Model;Notes\nAX-1;CH-F46;ok, mostly\n');
		expect(r.ok && r.value.delimiter).toBe(';');
		expect(r.ok && r.value.rows[0].cells).toEqual(['AX-1', 'CH-F46', 'ok, mostly']);
	});

	test('rows are numbered as a spreadsheet shows them; trailing blank lines are not rows', () => {
		const r = parseCsvTable('Tag,Model\nA,CH-F46\n\nB,CH-F52\n\n\n');
		expect(r.ok && r.value.rows.map((x) => x.rowNumber)).toEqual([2, 3, 4]);
	});

	test('blank and repeated headers get names', () => {
		const r = parseCsvTable('Tag,,Tag\n1,2,3\n');
		expect(r.ok && r.value.headers).toEqual(['Tag', 'Column 2', 'Tag (2)']);
	});

	test('an unclosed quote refuses the file and names the row', () => {
		const r = parseCsvTable('Tag,Model\nA,CH-F46\n"B,CH-F52\nC,CH-F58\n');
		expect(r).toEqual({ ok: false, message: expect.stringMatching(/Row 3 opens a quote/) });
	});

	test('too many rows', () => {
		const text = 'Tag,Model\n' + Array.from({ length: MAX_IMPORT_ROWS + 1 }, (_, i) => `T${i},CH-F46`).join('\n');
		const r = parseCsvTable(text);
		expect(r.ok).toBe(false);
	});

	test('bytes to table in one step, with a BOM', () => {
		const r = readCsvTable(new Uint8Array([0xef, 0xbb, 0xbf, ...enc('Tag,Model\nA,CH-F46\n')]));
		expect(r.ok && r.value.headers).toEqual(['Tag', 'Model']);
	});
});

type K = 'tag' | 'model' | 'notes';
const FIELDS: ImportField<K>[] = [
	{ key: 'tag', label: 'Tag', required: false, aliases: ['tag', 'original tag'] },
	{ key: 'model', label: 'Model', required: true, aliases: ['model', 'part number'] },
	{ key: 'notes', label: 'Notes', required: false, aliases: ['notes', 'comment'] }
];

describe('map-columns step', () => {
	test('header words are normalised', () => {
		expect(normalizeHeader('  Original_Tag #')).toBe('original tag');
	});

	test('guesses exact names first, then headers that contain a name', () => {
		expect(guessColumnMap(FIELDS, ['Core Tag No', 'Part Number', 'Comments from yard'])).toEqual({ tag: 0, model: 1, notes: 2 });
		expect(guessColumnMap(FIELDS, ['Qty', 'MODEL'])).toEqual({ tag: null, model: 1, notes: null });
	});

	test('a column is used for one field only', () => {
		const r = checkColumnMap(FIELDS, ['A', 'B'], { tag: '0', model: '0', notes: '' });
		expect(r).toEqual({ ok: false, map: { tag: 0, model: 0, notes: null }, errors: { model: 'Column "A" is already used for the tag.' } });
	});

	test('a required field must be mapped; a column outside the file is refused', () => {
		const r = checkColumnMap(FIELDS, ['A', 'B'], { tag: '5', model: '', notes: '' });
		expect(r).toEqual({
			ok: false,
			map: { tag: null, model: null, notes: null },
			errors: { tag: "Choose one of the file's columns for the tag.", model: 'Choose the column that holds the model.' }
		});
	});

	test('applying the map trims cells, drops control characters and flags extra cells', () => {
		const rows = applyColumnMap(
			{ headers: ['t', 'm'], delimiter: ',', rows: [{ rowNumber: 2, cells: [' A\u0007 ', 'CH-F46'] }, { rowNumber: 3, cells: ['B', 'CH-F46', 'stray'] }, { rowNumber: 4, cells: ['', ''] }] },
			{ tag: 0, model: 1, notes: null }
		);
		expect(rows[0]).toEqual({ rowNumber: 2, values: { tag: 'A', model: 'CH-F46', notes: '' }, extraCells: false, blank: false });
		expect(rows[1].extraCells).toBe(true);
		expect(rows[2].blank).toBe(true);
	});
});

describe('writing CSV (the shared writer, src/lib/csv/write.ts; more in csv-write.test.ts)', () => {
	const line = (cells: (string | number)[]) => toCsv(cells.map((_, i) => `h${i}`), [cells]).slice(1).split('\r\n')[1];
	test('RFC 4180 §2 rules 6 and 7: quote fields with commas, quotes or line breaks; double the quotes', () => {
		expect(line(['plain'])).toBe('plain');
		expect(line(['a,b'])).toBe('"a,b"');
		expect(line(['say "hi"'])).toBe('"say ""hi"""');
		expect(toCsv(['x'], [['two\nlines']]).slice(1)).toBe('x\r\n"two\nlines"\r\n');
		expect(toCsv(['a', 'b'], [[1, 'x']])).toBe('\uFEFFa,b\r\n1,x\r\n');
	});

	test('formula-looking cells are defused (OWASP "CSV Injection": prefix = + - @ with a quote)', () => {
		expect(line(['=SUM(A1)'])).toBe(`"'=SUM(A1)"`);
		expect(line(['@cmd'])).toBe(`"'@cmd"`);
		expect(line([-5])).toBe('-5'); // numbers stay numbers
	});

	test('papaparse reads back what we write (round trip against an independent parser)', () => {
		const cell = fc.string({ maxLength: 12 }).filter((s) => !/^[=+\-@\t\r]/.test(s));
		fc.assert(
			fc.property(fc.array(fc.array(cell, { minLength: 2, maxLength: 2 }), { minLength: 1, maxLength: 5 }), (rows) => {
				const text = toCsv(['h1', 'h2'], rows);
				const back = Papa.parse<string[]>(text, { delimiter: ',', newline: '\r\n', skipEmptyLines: false }).data;
				expect(back.slice(1, rows.length + 1)).toEqual(rows);
			}),
			{ numRuns: 300 }
		);
	});
});
