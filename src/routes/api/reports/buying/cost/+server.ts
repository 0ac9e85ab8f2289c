import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { costPerGoodReport } from '$lib/server/reports/buying';
import { costQueryFromUrl } from '$lib/server/reports/decision-query';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const { q, f } = costQueryFromUrl(url);
	if (!q.success) return apiError(400, 'invalid', q.error.issues[0]?.message ?? 'Check the grouping.', { fields: zodFields(q.error) });
	if (!f.success) return apiError(400, 'invalid', f.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(f.error) });
	const { from, to, model, source } = f.data;
	return json(costPerGoodReport(getDb(), q.data.kind, { from, to, model, source }));
};
