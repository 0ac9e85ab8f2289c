/** The filters every owner's report reads from the URL, so a view can be bookmarked and shared. */
import { z } from 'zod';
import { LOT_SOURCES } from '../db/schema';
import { LOT_SORTS } from './scrap';

const day = z
	.string()
	.regex(/^\d{4}-\d{2}-\d{2}$/, 'Dates are YYYY-MM-DD.')
	.refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), 'That date does not exist.');

export const reportFilterSchema = z
	.object({
		from: day.optional(),
		to: day.optional(),
		supplier: z.coerce.number({ error: 'Choose a supplier from the list.' }).int().positive('Choose a supplier from the list.').optional(),
		model: z.string().trim().min(1).max(40).optional(),
		source: z.enum(LOT_SOURCES, { error: 'Choose a source type from the list.' }).optional()
	})
	.refine((f) => !f.from || !f.to || f.from <= f.to, { message: 'The start date is after the end date.', path: ['from'] });

export type ReportFilter = z.infer<typeof reportFilterSchema>;

/** The named query parameters that are present and not blank, trimmed. */
function paramsOf(url: URL, keys: readonly string[]): Record<string, string> {
	const raw: Record<string, string> = {};
	for (const key of keys) {
		const v = url.searchParams.get(key);
		if (v !== null && v.trim() !== '') raw[key] = v.trim();
	}
	return raw;
}

export function reportFilterFromUrl(url: URL) {
	return reportFilterSchema.safeParse(paramsOf(url, ['from', 'to', 'supplier', 'model', 'source']));
}

/** The lot table's sort and page, read from the URL beside the filter (`per=all` for an export). */
export const lotViewSchema = z.object({
	sort: z.enum(LOT_SORTS, { error: 'Sort by received, lot, rate, scrap cost or per good core.' }).default('receivedOn'),
	dir: z.enum(['asc', 'desc'], { error: 'Direction is asc or desc.' }).default('asc'),
	page: z.coerce.number({ error: 'Page is a whole number.' }).int('Page is a whole number.').min(1, 'Pages start at 1.').max(1_000_000).default(1),
	per: z.union([z.literal('all'), z.coerce.number({ error: 'Rows per page: 10 to 500, or all.' }).int().min(10, 'Rows per page: 10 to 500, or all.').max(500, 'Rows per page: 10 to 500, or all.')]).default(50)
});

export function lotViewFromUrl(url: URL) {
	return lotViewSchema.safeParse(paramsOf(url, ['sort', 'dir', 'page', 'per']));
}
