import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { listUnits } from '$lib/server/units';
import { filterFromUrl } from '$lib/unit-filter';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const parsed = filterFromUrl(url);
	if (!parsed.success) {
		return apiError(400, 'invalid', parsed.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(parsed.error) });
	}
	const { held, ...rest } = parsed.data;
	return json(listUnits(getDb(), { ...rest, held: held === undefined ? undefined : held === 'yes' }));
};
