import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { reportFilterFromUrl } from '$lib/server/reports/filter';
import { flowPeriod, flowReport } from '$lib/server/reports/flow';
import { badNumbersAs400 } from '$lib/server/bad-numbers';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) =>
	badNumbersAs400(() => {
		const parsed = reportFilterFromUrl(url);
		if (!parsed.success) return apiError(400, 'invalid', parsed.error.issues[0]?.message ?? 'Check the filter.', { fields: zodFields(parsed.error) });
		return json(flowReport(getDb(), flowPeriod(parsed.data.from, parsed.data.to)));
	});
