/**
 * The map-columns step of any table import: the importer names the fields it wants, the file
 * has whatever headers it has, and the person picks which column feeds which field (we guess
 * first from the header words). Generic: used by the core-lot manifest, ready for an order import.
 */
import type { CsvTable } from './csv-table';

export interface ImportField<K extends string = string> {
	key: K;
	label: string;
	required: boolean;
	/** Header words that probably mean this field, lower case, spaces for separators. */
	aliases: readonly string[];
}

/** Field key → column index in the table, or null when the field is not in the file. */
export type ColumnMap<K extends string = string> = Record<K, number | null>;

export function normalizeHeader(h: string): string {
	return h
		.toLowerCase()
		.replace(/[_\-./#:]+/g, ' ')
		.replace(/\s+/g, ' ')
		.trim();
}

/** Guess the map from the headers: exact alias first, then a header that contains an alias. */
export function guessColumnMap<K extends string>(fields: readonly ImportField<K>[], headers: readonly string[]): ColumnMap<K> {
	const norm = headers.map(normalizeHeader);
	const taken = new Set<number>();
	const map = {} as ColumnMap<K>;
	for (const pass of ['exact', 'contains'] as const) {
		for (const f of fields) {
			if (map[f.key] !== undefined && map[f.key] !== null) continue;
			const idx = norm.findIndex(
				(h, i) => !taken.has(i) && f.aliases.some((a) => (pass === 'exact' ? h === a : h.includes(a)))
			);
			if (idx >= 0) {
				map[f.key] = idx;
				taken.add(idx);
			} else map[f.key] = null;
		}
	}
	return map;
}

/** Read a map from form values ("" or a column number per field) and check it. */
export function checkColumnMap<K extends string>(
	fields: readonly ImportField<K>[],
	headers: readonly string[],
	raw: Partial<Record<K, unknown>>
): { ok: true; map: ColumnMap<K> } | { ok: false; map: ColumnMap<K>; errors: Partial<Record<K, string>> } {
	const map = {} as ColumnMap<K>;
	const errors: Partial<Record<K, string>> = {};
	const used = new Map<number, K>();
	for (const f of fields) {
		const v = raw[f.key];
		const s = v === undefined || v === null ? '' : String(v).trim();
		if (s === '') {
			map[f.key] = null;
			if (f.required) errors[f.key] = `Choose the column that holds the ${f.label.toLowerCase()}.`;
			continue;
		}
		const n = Number(s);
		if (!Number.isInteger(n) || n < 0 || n >= headers.length) {
			map[f.key] = null;
			errors[f.key] = `Choose one of the file's columns for the ${f.label.toLowerCase()}.`;
			continue;
		}
		const other = used.get(n);
		if (other !== undefined) {
			const otherLabel = fields.find((x) => x.key === other)!.label.toLowerCase();
			errors[f.key] = `Column "${headers[n]}" is already used for the ${otherLabel}.`;
		}
		used.set(n, f.key);
		map[f.key] = n;
	}
	return Object.keys(errors).length ? { ok: false, map, errors } : { ok: true, map };
}

export interface MappedRow<K extends string> {
	rowNumber: number;
	values: Record<K, string>;
	/** The row has more cells than the header: usually a comma inside a value without quotes. */
	extraCells: boolean;
	/** Every cell of the row is blank. */
	blank: boolean;
}

/** Pick each field's cell out of every row (trimmed; a missing cell reads as ""). */
export function applyColumnMap<K extends string>(table: CsvTable, map: ColumnMap<K>): MappedRow<K>[] {
	const keys = Object.keys(map) as K[];
	return table.rows.map((r) => {
		const values = {} as Record<K, string>;
		for (const k of keys) {
			const idx = map[k];
			values[k] = idx === null ? '' : (r.cells[idx] ?? '').replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, '').trim();
		}
		const extraCells = r.cells.length > table.headers.length && r.cells.slice(table.headers.length).some((c) => c.trim() !== '');
		return { rowNumber: r.rowNumber, values, extraCells, blank: r.cells.every((c) => c.trim() === '') };
	});
}
