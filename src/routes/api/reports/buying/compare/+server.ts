import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { compareGroups } from '$lib/server/reports/buying';
import { compareQueryFromUrl } from '$lib/server/reports/decision-query';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const { q, f } = compareQueryFromUrl(url);
	if (!q.success) return apiError(400, 'invalid', q.error.issues[0]?.message ?? 'Choose two to compare.', { fields: zodFields(q.error) });
	if (!f.success) return apiError(400, 'invalid', f.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(f.error) });
	const { from, to, model, source } = f.data;
	const c = compareGroups(getDb(), q.data.kind, q.data.a, q.data.b, { from, to, model, source });
	if (!c) return apiError(404, 'not_found', 'One of the two has no cores in this view. Choose from the list or widen the dates.');
	return json(c);
};
