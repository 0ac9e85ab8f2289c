import Papa from 'papaparse';
import { expect, test } from 'vitest';
import { guessMap, parseMachineNumber, readingFromRow } from '../../src/lib/domain/balance/csv-map';

// An invented export, laid out the way spreadsheets usually are (semicolons and decimal commas are common practice in Europe).
const CSV = `Run;Plane 1 amount [mg];Plane 1 angle [deg];Plane 2 amount [mg];Plane 2 angle [deg]
1;12,5 mg;40°;8,25;-20
2;0,4;10;0,3;100`;

test('columns are guessed from the headers and a row becomes a reading', () => {
	// Source: papaparse (header mode) reads the CSV; angle −20° is 340° (angles modulo 360).
	const parsed = Papa.parse<Record<string, string>>(CSV, { header: true, skipEmptyLines: true, delimiter: ';' });
	const map = guessMap(parsed.meta.fields!);
	expect(map).toEqual({
		compAmount: 'Plane 1 amount [mg]',
		compAngle: 'Plane 1 angle [deg]',
		turbAmount: 'Plane 2 amount [mg]',
		turbAngle: 'Plane 2 angle [deg]'
	});
	expect(readingFromRow(parsed.data[0], map)).toEqual({ ok: true, compAmount: 12.5, compAngle: 40, turbAmount: 8.25, turbAngle: 340 });
	expect(readingFromRow(parsed.data[1], map)).toMatchObject({ ok: true, compAmount: 0.4, turbAngle: 100 });
});

test('a missing mapping or a cell that is not a number says which', () => {
	// Source: the mapping rules of this module.
	expect(readingFromRow({ a: '1' }, {})).toEqual({ ok: false, message: 'Choose the column for the compressor amount.' });
	const r = readingFromRow({ a: 'n/a', b: '1', c: '1', d: '1' }, { compAmount: 'a', compAngle: 'b', turbAmount: 'c', turbAngle: 'd' });
	expect(r).toEqual({ ok: false, message: 'The compressor amount column ("a") has "n/a", not a number.' });
	expect(parseMachineNumber(' 3.75 g ')).toBe(3.75);
	expect(parseMachineNumber('')).toBeNull();
});
