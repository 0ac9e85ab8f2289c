import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, zodFields } from '$lib/server/http';
import { skidQuote } from '$lib/server/reports/buying';
import { skidQueryFromUrl } from '$lib/server/reports/decision-query';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const q = skidQueryFromUrl(url);
	if (!q.success) return apiError(400, 'invalid', q.error.issues[0]?.message ?? 'Check the offer.', { fields: zodFields(q.error) });
	const a = skidQuote(getDb(), { supplier: q.data.supplier, model: q.data.model, cores: q.data.cores, priceCents: q.data.price });
	if (!a) return apiError(404, 'not_found', 'There is no such supplier. Choose one from the list.');
	return json(a);
};
