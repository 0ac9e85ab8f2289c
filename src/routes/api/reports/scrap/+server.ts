import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { reportFilterFromUrl } from '$lib/server/reports/filter';
import { scrapReport } from '$lib/server/reports/scrap';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const parsed = reportFilterFromUrl(url);
	if (!parsed.success) return apiError(400, 'invalid', parsed.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(parsed.error) });
	return json(scrapReport(getDb(), parsed.data));
};
