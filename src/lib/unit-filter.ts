/** The unit-list filter as it appears in a URL, shared by the page and the API. */
import { z } from 'zod';
import { STAGES, UNIT_STATES } from './domain/units/states';

const blankToUndefined = (v: unknown) => (v === '' || v === null ? undefined : v);

export const unitFilterSchema = z.object({
	state: z.preprocess(blankToUndefined, z.enum(UNIT_STATES, { error: 'Unknown state.' }).optional()),
	stage: z.preprocess(blankToUndefined, z.enum(STAGES, { error: 'Unknown stage.' }).optional()),
	lot: z.preprocess(blankToUndefined, z.string().max(40).optional()),
	model: z.preprocess(blankToUndefined, z.string().max(40).optional()),
	q: z.preprocess(blankToUndefined, z.string().max(100, 'Search for at most 100 characters.').optional()),
	held: z.preprocess(blankToUndefined, z.enum(['yes', 'no']).optional()),
	page: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(100000).optional()),
	pageSize: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(200).optional())
});

export function filterFromUrl(url: URL) {
	return unitFilterSchema.safeParse(Object.fromEntries(url.searchParams));
}
