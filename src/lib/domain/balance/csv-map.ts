/**
 * Reading a run out of a balancing machine's CSV export by mapping its columns: the tech says
 * which column holds each plane's amount and angle; no machine's own format is assumed.
 */
export interface ColumnMap {
	compAmount: string;
	compAngle: string;
	turbAmount: string;
	turbAngle: string;
}

export const MAP_FIELDS: (keyof ColumnMap)[] = ['compAmount', 'compAngle', 'turbAmount', 'turbAngle'];

/** A number as machines write it: decimal point or comma, optional unit or degree sign after it. */
export function parseMachineNumber(raw: string | undefined): number | null {
	if (raw === undefined) return null;
	const m = raw.trim().replace(/\s/g, '').match(/^([+-]?\d+(?:[.,]\d+)?)/);
	if (!m) return null;
	const v = Number(m[1].replace(',', '.'));
	return Number.isFinite(v) ? v : null;
}

/** Guess a column for each field from header words (amount/unbalance, angle/phase; plane 1/A/comp, plane 2/B/turb). */
export function guessMap(headers: readonly string[]): Partial<ColumnMap> {
	const find = (plane: RegExp, what: RegExp) => headers.find((h) => plane.test(h) && what.test(h));
	const p1 = /(1|\bA\b|comp|left)/i;
	const p2 = /(2|\bB\b|turb|right)/i;
	const amt = /(amount|unbal|mass|value|amp|mag)/i;
	const ang = /(angle|phase|deg|°)/i;
	const out: Partial<ColumnMap> = {};
	const set = (k: keyof ColumnMap, v: string | undefined) => {
		if (v !== undefined) out[k] = v;
	};
	set('compAmount', find(p1, amt));
	set('compAngle', find(p1, ang));
	set('turbAmount', find(p2, amt));
	set('turbAngle', find(p2, ang));
	return out;
}

export type MappedReading =
	| { ok: true; compAmount: number; compAngle: number; turbAmount: number; turbAngle: number }
	| { ok: false; message: string };

const FIELD_WORD: Record<keyof ColumnMap, string> = {
	compAmount: 'compressor amount',
	compAngle: 'compressor angle',
	turbAmount: 'turbine amount',
	turbAngle: 'turbine angle'
};

/** One row of the export as a reading; angles are brought into 0 ≤ angle < 360. */
export function readingFromRow(row: Record<string, string>, map: Partial<ColumnMap>): MappedReading {
	const out: Record<string, number> = {};
	for (const f of MAP_FIELDS) {
		const col = map[f];
		if (!col) return { ok: false, message: `Choose the column for the ${FIELD_WORD[f]}.` };
		const v = parseMachineNumber(row[col]);
		if (v === null) return { ok: false, message: `The ${FIELD_WORD[f]} column ("${col}") has "${String(row[col] ?? '').slice(0, 20)}", not a number.` };
		if (f.endsWith('Amount') && v < 0) return { ok: false, message: `The ${FIELD_WORD[f]} is negative.` };
		out[f] = f.endsWith('Angle') ? ((v % 360) + 360) % 360 : v;
	}
	return { ok: true, compAmount: out.compAmount, compAngle: out.compAngle, turbAmount: out.turbAmount, turbAngle: out.turbAngle };
}
