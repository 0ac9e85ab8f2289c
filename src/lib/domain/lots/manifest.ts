/**
 * A core lot's manifest: one row per core with its original tag, model and notes. Rows are
 * checked against the shop's models and the tags already in the lot; bad rows are kept with
 * their reason so the person sees exactly what will be skipped.
 */
import type { ImportField, MappedRow } from '../import/map-columns';

export const MAX_TAG_LENGTH = 60;
export const MAX_UNIT_NOTES_LENGTH = 500;

export type ManifestKey = 'originalTag' | 'model' | 'notes';

export const MANIFEST_FIELDS: readonly ImportField<ManifestKey>[] = [
	{ key: 'originalTag', label: 'Original tag', required: false, aliases: ['original tag', 'tag', 'core tag', 'tag no', 'tag number', 'core id'] },
	{ key: 'model', label: 'Model', required: true, aliases: ['model', 'model code', 'part', 'part no', 'part number', 'turbo'] },
	{ key: 'notes', label: 'Notes', required: false, aliases: ['notes', 'note', 'comment', 'comments', 'remarks', 'condition'] }
];

export interface KnownModel {
	id: number;
	code: string;
}

export interface ManifestRowOk {
	rowNumber: number;
	ok: true;
	originalTag: string;
	modelId: number;
	modelCode: string;
	notes: string;
}

export interface ManifestRowBad {
	rowNumber: number;
	ok: false;
	originalTag: string;
	model: string;
	notes: string;
	reason: string;
}

export type ManifestRow = ManifestRowOk | ManifestRowBad;

export interface ManifestCheck {
	rows: ManifestRow[];
	good: ManifestRowOk[];
	bad: ManifestRowBad[];
}

/** Model codes match whatever the case and spacing: "ch f46", "CH-F46" and "chf46" are one model. */
export function modelKey(code: string): string {
	return code.toUpperCase().replace(/[\s\-_.]+/g, '');
}

/** Tags are compared trimmed and case-blind: "qt-1" and "QT-1 " are the same tag. */
export function tagKey(tag: string): string {
	return tag.trim().replace(/\s+/g, ' ').toUpperCase();
}

export interface UnitDraft {
	originalTag: string;
	model: string;
	notes: string;
}

export interface CheckContext {
	models: readonly KnownModel[];
	/** Tags already in the lot: tagKey → serial. */
	tagsInLot: ReadonlyMap<string, string>;
}

/** Check one unit (from a manifest row or the add-one form); null when it is good. */
export function unitProblem(
	draft: UnitDraft,
	ctx: CheckContext
): { reason: string; field: ManifestKey } | { model: KnownModel } {
	const model = draft.model.trim();
	const tag = draft.originalTag.trim();
	if (!model) return { field: 'model', reason: 'No model given.' };
	const found = ctx.models.find((m) => modelKey(m.code) === modelKey(model));
	if (!found) return { field: 'model', reason: `Unknown model "${model.slice(0, 40)}".` };
	if (tag.length > MAX_TAG_LENGTH) return { field: 'originalTag', reason: `Tag too long (${tag.length} characters; at most ${MAX_TAG_LENGTH}).` };
	if (draft.notes.trim().length > MAX_UNIT_NOTES_LENGTH) {
		return { field: 'notes', reason: `Notes too long (${draft.notes.trim().length} characters; at most ${MAX_UNIT_NOTES_LENGTH}).` };
	}
	if (tag) {
		const serial = ctx.tagsInLot.get(tagKey(tag));
		if (serial) return { field: 'originalTag', reason: `Tag ${tag} is already in this lot (${serial}).` };
	}
	return { model: found };
}

/** Check every mapped row. The first row with a tag keeps it; later rows with the same tag are bad. */
export function checkManifest(rows: readonly MappedRow<ManifestKey>[], ctx: CheckContext): ManifestCheck {
	const firstSeen = new Map<string, number>();
	const out: ManifestRow[] = rows.map((r) => {
		const { originalTag, model, notes } = r.values;
		const bad = (reason: string): ManifestRowBad => ({ rowNumber: r.rowNumber, ok: false, originalTag, model, notes, reason });
		if (r.blank) return bad('Empty row.');
		if (!originalTag && !model && !notes) return bad('Nothing in the chosen columns.');
		if (r.extraCells) return bad('More cells than the header has columns (a comma inside a value without quotes?).');
		const problem = unitProblem(r.values, ctx);
		if ('reason' in problem) return bad(problem.reason);
		if (originalTag) {
			const key = tagKey(originalTag);
			const first = firstSeen.get(key);
			if (first !== undefined) return bad(`Duplicate tag: ${originalTag} is also on row ${first}.`);
			firstSeen.set(key, r.rowNumber);
		}
		return { rowNumber: r.rowNumber, ok: true, originalTag, modelId: problem.model.id, modelCode: problem.model.code, notes };
	});
	return {
		rows: out,
		good: out.filter((r): r is ManifestRowOk => r.ok),
		bad: out.filter((r): r is ManifestRowBad => !r.ok)
	};
}
