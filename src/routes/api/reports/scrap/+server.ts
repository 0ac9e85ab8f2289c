import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { lotViewFromUrl, reportFilterFromUrl } from '$lib/server/reports/filter';
import { scrapReport } from '$lib/server/reports/scrap';
import { badNumbersAs400 } from '$lib/server/bad-numbers';
import type { RequestHandler } from './$types';

/** The scrap report for a filter; the lot table one page at a time (`sort`, `dir`, `page`, `per`; `per=all` exports every lot). */
export const GET: RequestHandler = async ({ url }) =>
	badNumbersAs400(() => {
		const parsed = reportFilterFromUrl(url);
		if (!parsed.success) return apiError(400, 'invalid', parsed.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(parsed.error) });
		const view = lotViewFromUrl(url);
		if (!view.success) return apiError(400, 'invalid', view.error.issues[0]?.message ?? 'Check the sort and page.', { fields: zodFields(view.error) });
		return json(scrapReport(getDb(), parsed.data, view.data));
	});
