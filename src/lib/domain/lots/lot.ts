/** Core lots as the office enters them: the form's rules, money in cents, lot codes. */
import { z } from 'zod';

export const LOT_SOURCE_KEYS = ['purchased_skid', 'customer_return', 'warranty_return'] as const;
export type LotSourceKey = (typeof LOT_SOURCE_KEYS)[number];

export const LOT_SOURCE_LABEL: Record<LotSourceKey, string> = {
	purchased_skid: 'Purchased skid',
	customer_return: 'Customer return',
	warranty_return: 'Warranty return'
};

export const MAX_LOT_EXPECTED = 5000;
export const MAX_LOT_NOTES = 1000;

const MONEY = /^\d{1,7}(\.\d{1,2})?$/;

/** "45", "45.5", "45.50" → cents; null when it is not an amount. Two decimals, as most currencies use. */
export function parseMoneyToCents(input: string): number | null {
	const s = input.trim().replace(/\s/g, '');
	if (!MONEY.test(s)) return null;
	const [whole, frac = ''] = s.split('.');
	return Number(whole) * 100 + Number(frac.padEnd(2, '0'));
}

/** Cents as an amount with two decimals; '—' for a value that is not a number. */
export function formatCents(cents: number): string {
	if (typeof cents !== 'number' || !Number.isFinite(cents)) return '—';
	const sign = cents < 0 ? '-' : '';
	const a = Math.abs(Math.trunc(cents));
	return `${sign}${Math.floor(a / 100).toLocaleString('en-US')}.${String(a % 100).padStart(2, '0')}`;
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

export function isCalendarDate(s: string): boolean {
	if (!ISO_DATE.test(s)) return false;
	const d = new Date(`${s}T00:00:00Z`);
	return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

/** The lot form. `today` is the server's date, YYYY-MM-DD; a lot may not arrive after tomorrow. */
export function lotFormSchema(today: string) {
	const tomorrow = new Date(Date.parse(`${today}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
	return z
		.object({
			supplierId: z.string().trim().max(12),
			source: z.enum(LOT_SOURCE_KEYS, { error: 'Choose where the cores come from.' }),
			receivedOn: z
				.string()
				.trim()
				.refine(isCalendarDate, 'Give the date the lot arrived (YYYY-MM-DD).')
				.refine((s) => s <= tomorrow, 'The received date is in the future.')
				.refine((s) => s >= '2000-01-01', 'The received date is too far back.'),
			costPerCore: z.string().trim().refine((s) => parseMoneyToCents(s) !== null, 'Give the price per core as a number, e.g. 45 or 45.50.'),
			expectedCount: z
				.number({ error: 'Give how many cores the lot should hold.' })
				.int('Give a whole number of cores.')
				.min(0, 'The count cannot be negative.')
				.max(MAX_LOT_EXPECTED, `At most ${MAX_LOT_EXPECTED} cores in one lot.`),
			notes: z.string().trim().max(MAX_LOT_NOTES, `Keep the notes under ${MAX_LOT_NOTES} characters.`)
		})
		.superRefine((v, ctx) => {
			if (v.source === 'purchased_skid' && !v.supplierId) {
				ctx.addIssue({ code: 'custom', path: ['supplierId'], message: 'A purchased skid needs its supplier.' });
			}
			if (v.supplierId && !/^\d+$/.test(v.supplierId)) {
				ctx.addIssue({ code: 'custom', path: ['supplierId'], message: 'Choose a supplier from the list.' });
			}
		});
}
export type LotForm = z.infer<ReturnType<typeof lotFormSchema>>;

/** Lot codes: "L", the received date as YYMMDD, a dash and a running number: L261201-16. */
export function nextLotCode(receivedOn: string, existing: readonly string[]): string {
	const prefix = `L${receivedOn.slice(2, 4)}${receivedOn.slice(5, 7)}${receivedOn.slice(8, 10)}-`;
	let max = 0;
	for (const code of existing) {
		const m = /^L\d{6}-(\d+)$/.exec(code);
		if (m) max = Math.max(max, Number(m[1]));
	}
	return `${prefix}${String(max + 1).padStart(2, '0')}`;
}

export const supplierSchema = z.object({
	name: z.string().trim().min(2, 'Give the supplier’s name.').max(80, 'Keep the name under 80 characters.'),
	notes: z.string().trim().max(500, 'Keep the notes under 500 characters.')
});
export type SupplierForm = z.infer<typeof supplierSchema>;

export const unitDraftSchema = z.object({
	model: z.string().trim().min(1, 'Choose the model.'),
	originalTag: z.string().trim(),
	notes: z.string().trim()
});
