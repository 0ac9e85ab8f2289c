/** The query parameters of the buying and drift reports, read from the URL with a sentence for each mistake. */
import { z } from 'zod';
import { GROUP_KINDS } from './buying';
import { reportFilterSchema } from './filter';
import { MAX_DRIFT_UNITS } from './drift';

function params(url: URL, keys: readonly string[]): Record<string, string> {
	const raw: Record<string, string> = {};
	for (const key of keys) {
		const v = url.searchParams.get(key);
		if (v !== null && v.trim() !== '') raw[key] = v.trim();
	}
	return raw;
}

const kind = z.enum(GROUP_KINDS, { error: 'Compare by supplier, lot, model or source.' }).default('supplier');
const groupKey = z.string().max(40, 'Choose from the list.').regex(/^[a-z0-9_]+$/, 'Choose from the list.');

const FILTER_KEYS = ['from', 'to', 'model', 'source'] as const;

export const compareQuerySchema = z
	.object({ kind, a: groupKey, b: groupKey })
	.refine((q) => q.a !== q.b, { message: 'Choose two different ones to compare.', path: ['b'] });

export function compareQueryFromUrl(url: URL) {
	const q = compareQuerySchema.safeParse(params(url, ['kind', 'a', 'b']));
	const f = reportFilterSchema.safeParse(params(url, FILTER_KEYS));
	return { q, f };
}

export function costQueryFromUrl(url: URL) {
	return { q: z.object({ kind }).safeParse(params(url, ['kind'])), f: reportFilterSchema.safeParse(params(url, FILTER_KEYS)) };
}

/** Money typed as dollars and cents ("32", "32.5", "32.50") → whole cents. */
const dollars = z
	.string({ error: 'Give the price per core.' })
	.regex(/^\d{1,6}(\.\d{1,2})?$/, 'The price per core is dollars and cents, e.g. 32.50.')
	.transform((s) => Math.round(Number(s) * 100))
	.refine((c) => c > 0, 'The price per core must be above 0.');

export const skidQuerySchema = z.object({
	supplier: z.coerce.number({ error: 'Choose a supplier from the list.' }).int('Choose a supplier from the list.').positive('Choose a supplier from the list.'),
	model: z.string().trim().min(1).max(40).optional(),
	cores: z.coerce.number({ error: 'The number of cores is a whole number.' }).int('The number of cores is a whole number.').min(1, 'A skid needs at least one core.').max(100_000, 'At most 100,000 cores in one skid.'),
	price: dollars
});

export function skidQueryFromUrl(url: URL) {
	return skidQuerySchema.safeParse(params(url, ['supplier', 'model', 'cores', 'price']));
}

export const driftQuerySchema = z.object({
	station: z.string().trim().min(1).max(40).optional(),
	model: z.string().trim().min(1).max(40).optional(),
	last: z.coerce
		.number({ error: `Units shown: a whole number from 2 to ${MAX_DRIFT_UNITS}.` })
		.int(`Units shown: a whole number from 2 to ${MAX_DRIFT_UNITS}.`)
		.min(2, `Units shown: a whole number from 2 to ${MAX_DRIFT_UNITS}.`)
		.max(MAX_DRIFT_UNITS, `Units shown: a whole number from 2 to ${MAX_DRIFT_UNITS}.`)
		.optional()
});

export function driftQueryFromUrl(url: URL) {
	return driftQuerySchema.safeParse(params(url, ['station', 'model', 'last']));
}
