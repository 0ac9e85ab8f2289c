/**
 * The teardown qualification: every item of the family's checklist answered pass, fail or
 * not applicable (with an optional measurement), and a verdict — accept, or scrap with a
 * reason. Pure: checks what a tech sent against the checklist they were shown.
 */
export const ITEM_RESULTS = ['pass', 'fail', 'na'] as const;
export type ItemResult = (typeof ITEM_RESULTS)[number];
export const RESULT_LABEL: Record<ItemResult, string> = { pass: 'Pass', fail: 'Fail', na: 'n.a.' };

export const VERDICTS = ['accept', 'scrap'] as const;
export type Verdict = (typeof VERDICTS)[number];

export interface ChecklistItemSpec {
	id: number;
	label: string;
	measureUnit: string | null;
}

export interface QualificationInput {
	verdict?: string | null;
	reasonCode?: string | null;
	note?: string | null;
	/** Minutes the teardown took, as typed (optional): counted as labour before the verdict. */
	labourMinutes?: string | null;
	/** Answers by item id: result and the measurement as typed. */
	answers: Record<number, { result?: string | null; measurement?: string | null }>;
}

export interface Answer {
	itemId: number;
	label: string;
	result: ItemResult;
	measurement: number | null;
	measureUnit: string | null;
}

export type Qualification =
	| { ok: true; verdict: Verdict; reasonCode: string | null; note: string | null; labourMinutes: number | null; answers: Answer[] }
	| { ok: false; message: string; fields: Record<string, string> };

export function checkQualification(items: readonly ChecklistItemSpec[], input: QualificationInput): Qualification {
	const fields: Record<string, string> = {};
	const verdict = input.verdict?.trim();
	if (verdict !== 'accept' && verdict !== 'scrap') fields.verdict = 'Choose a verdict: accept or scrap.';
	const reasonCode = input.reasonCode?.trim() || null;
	if (verdict === 'scrap' && !reasonCode) fields.reasonCode = 'Choose a scrap reason.';
	const note = input.note?.trim() || null;
	if (note && note.length > 1000) fields.note = 'Keep the note under 1000 characters.';
	const labourMinutes = parseLabourMinutes(input.labourMinutes);
	if (labourMinutes === undefined) fields.labourMinutes = `Teardown minutes: a whole number from 0 to ${MAX_LABOUR_MINUTES}, or leave it empty.`;

	const answers: Answer[] = [];
	const missing: string[] = [];
	for (const item of items) {
		const a = input.answers[item.id] ?? {};
		const result = a.result?.trim();
		if (!result || !(ITEM_RESULTS as readonly string[]).includes(result)) {
			missing.push(item.label);
			fields[`item-${item.id}`] = 'Answer pass, fail or n.a.';
			continue;
		}
		let measurement: number | null = null;
		const typed = a.measurement?.trim().replace(',', '.');
		if (typed) {
			const n = Number(typed);
			if (!Number.isFinite(n)) {
				fields[`measure-${item.id}`] = `${item.label}: the measurement must be a number.`;
				continue;
			}
			measurement = n;
		}
		answers.push({ itemId: item.id, label: item.label, result: result as ItemResult, measurement, measureUnit: item.measureUnit });
	}
	if (Object.keys(fields).length) {
		const message =
			fields.verdict ??
			fields.reasonCode ??
			(missing.length ? `Answer every item: ${missing.join(', ')} ${missing.length === 1 ? 'is' : 'are'} not answered.` : undefined) ??
			Object.values(fields)[0];
		return { ok: false, message, fields };
	}
	return { ok: true, verdict: verdict as Verdict, reasonCode: verdict === 'scrap' ? reasonCode : null, note, labourMinutes: labourMinutes ?? null, answers };
}

/** A teardown longer than a shift is a typing slip, not a record. */
export const MAX_LABOUR_MINUTES = 600;

/** Empty → null; a whole number 0–600 → that number; anything else → undefined (refused). */
export function parseLabourMinutes(typed: string | null | undefined): number | null | undefined {
	const t = typed?.trim() ?? '';
	if (!t) return null;
	if (!/^\d{1,4}$/.test(t)) return undefined;
	const n = Number(t);
	return n <= MAX_LABOUR_MINUTES ? n : undefined;
}
