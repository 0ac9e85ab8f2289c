/**
 * Reading an uploaded CSV file into a table of strings: the bytes are checked for an encoding
 * we can read (UTF-8, with or without a byte-order mark), then parsed (comma, semicolon or tab,
 * found from the file). Anything we cannot read gets a sentence that says what to do instead.
 *
 * Generic: knows nothing about lots or orders; the map-columns step comes next (map-columns.ts).
 */
import Papa from 'papaparse';

export const MAX_IMPORT_BYTES = 256 * 1024;
export const MAX_IMPORT_ROWS = 2000;

export interface CsvTable {
	/** Header cells as written, blanks replaced by "Column N", repeats numbered. */
	headers: string[];
	/** Data rows; each carries its row number as a spreadsheet shows it (the header is row 1). */
	rows: { rowNumber: number; cells: string[] }[];
	/** The delimiter that was found. */
	delimiter: string;
}

export type CsvResult<T> = { ok: true; value: T } | { ok: false; message: string };

const SAVE_AS = 'Save it from the spreadsheet as "CSV UTF-8" and upload it again.';

/** Turn uploaded bytes into text, or say why not. A UTF-8 byte-order mark is dropped. */
export function decodeCsvBytes(bytes: Uint8Array): CsvResult<string> {
	if (bytes.length === 0) return { ok: false, message: 'The file is empty. Choose the manifest file and upload it again.' };
	if (bytes.length > MAX_IMPORT_BYTES) {
		return { ok: false, message: `The file is ${Math.ceil(bytes.length / 1024)} KB; the most we take at once is 256 KB. Split it and import the parts.` };
	}
	// UTF-16 and UTF-32 byte-order marks (Unicode Standard, ch. 23.8 "Specials": U+FEFF as BOM).
	if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
		return { ok: false, message: `The file is in UTF-16 ("Unicode text"), which we do not read. ${SAVE_AS}` };
	}
	let start = 0;
	if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) start = 3;
	// UTF-16 without a mark shows as a NUL byte beside nearly every ASCII character.
	const sample = bytes.subarray(start, Math.min(bytes.length, start + 4096));
	let nuls = 0;
	for (const b of sample) if (b === 0) nuls++;
	if (nuls > 0) {
		return nuls * 4 >= sample.length
			? { ok: false, message: `The file looks like UTF-16 text, which we do not read. ${SAVE_AS}` }
			: { ok: false, message: 'The file contains binary data, not text. Upload the manifest as a CSV file.' };
	}
	try {
		const text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes.subarray(start));
		return { ok: true, value: text };
	} catch {
		const at = firstInvalidUtf8(bytes, start);
		const line = lineOf(bytes, start, at);
		return {
			ok: false,
			message: `The file is not UTF-8 text (line ${line} has a byte we cannot read, as Latin-1 or Windows "ANSI" files do). ${SAVE_AS}`
		};
	}
}

/** Offset of the first byte that breaks UTF-8 (RFC 3629, section 4 syntax). */
export function firstInvalidUtf8(bytes: Uint8Array, from = 0): number {
	let i = from;
	while (i < bytes.length) {
		const b = bytes[i];
		let need = 0;
		let min = 0;
		if (b < 0x80) {
			i++;
			continue;
		} else if (b >= 0xc2 && b <= 0xdf) {
			need = 1;
			min = 0x80;
		} else if (b >= 0xe0 && b <= 0xef) {
			need = 2;
			min = 0x800;
		} else if (b >= 0xf0 && b <= 0xf4) {
			need = 3;
			min = 0x10000;
		} else return i;
		if (i + need >= bytes.length) return i;
		let cp = b & (0xff >> (need + 2));
		for (let k = 1; k <= need; k++) {
			const c = bytes[i + k];
			if (c === undefined || (c & 0xc0) !== 0x80) return i;
			cp = (cp << 6) | (c & 0x3f);
		}
		if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) return i;
		i += need + 1;
	}
	return -1;
}

function lineOf(bytes: Uint8Array, from: number, at: number): number {
	let line = 1;
	for (let i = from; i < at && i < bytes.length; i++) if (bytes[i] === 0x0a) line++;
	return line;
}

/** Parse CSV text: the first non-empty row is the header. */
export function parseCsvTable(text: string): CsvResult<CsvTable> {
	const body = text.replace(/^\uFEFF/, '');
	if (body.trim() === '') return { ok: false, message: 'The file is empty. Choose the manifest file and upload it again.' };
	const parsed = Papa.parse<string[]>(body, { header: false, skipEmptyLines: false, delimitersToGuess: [',', ';', '\t', '|'] });
	const quoteError = parsed.errors.find((e) => e.type === 'Quotes');
	if (quoteError) {
		const row = (quoteError.row ?? 0) + 1;
		return { ok: false, message: `Row ${row} opens a quote (") that never closes, so the rest of the file cannot be read. Fix that row and upload again.` };
	}
	const all = parsed.data.map((cells, i) => ({ rowNumber: i + 1, cells: cells.map((c) => String(c ?? '')) }));
	const isBlank = (cells: string[]) => cells.every((c) => c.trim() === '');
	// Blank lines after the last row are not rows.
	while (all.length && isBlank(all[all.length - 1].cells)) all.pop();
	const headerAt = all.findIndex((r) => !isBlank(r.cells));
	if (headerAt < 0) return { ok: false, message: 'The file is empty. Choose the manifest file and upload it again.' };
	const rows = all.slice(headerAt + 1);
	if (rows.length === 0) {
		return { ok: false, message: 'The file has a header row but no data rows. Add one row per core under the header.' };
	}
	if (rows.length > MAX_IMPORT_ROWS) {
		return { ok: false, message: `The file has ${rows.length} rows; the most we take at once is ${MAX_IMPORT_ROWS}. Split it and import the parts.` };
	}
	return { ok: true, value: { headers: headerNames(all[headerAt].cells), rows, delimiter: parsed.meta.delimiter } };
}

function headerNames(cells: string[]): string[] {
	const seen = new Map<string, number>();
	return cells.map((raw, i) => {
		const name = raw.trim() || `Column ${i + 1}`;
		const n = (seen.get(name.toLowerCase()) ?? 0) + 1;
		seen.set(name.toLowerCase(), n);
		return n > 1 ? `${name} (${n})` : name;
	});
}

/** Bytes to table in one step. */
export function readCsvTable(bytes: Uint8Array): CsvResult<CsvTable> {
	const text = decodeCsvBytes(bytes);
	return text.ok ? parseCsvTable(text.value) : text;
}
