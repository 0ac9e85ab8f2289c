import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError } from '$lib/server/http';
import { traceBack } from '$lib/server/reports/warranty';
import { badNumbersAs400 } from '$lib/server/bad-numbers';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) =>
	badNumbersAs400(() => {
		const found = traceBack(getDb(), params.serial);
		if (!found) return apiError(404, 'not_found', `No unit ${params.serial} in the shop.`);
		return json(found);
	});
