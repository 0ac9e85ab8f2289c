import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { driftQueryFromUrl } from '$lib/server/reports/decision-query';
import { driftReport } from '$lib/server/reports/drift';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const q = driftQueryFromUrl(url);
	if (!q.success) return apiError(400, 'invalid', q.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(q.error) });
	return json(driftReport(getDb(), q.data));
};
