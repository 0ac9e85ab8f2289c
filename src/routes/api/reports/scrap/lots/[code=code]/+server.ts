import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError } from '$lib/server/http';
import { lotReport } from '$lib/server/reports/lot';
import { badNumbersAs400 } from '$lib/server/bad-numbers';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) =>
	badNumbersAs400(() => {
		const found = lotReport(getDb(), params.code);
		if (!found) return apiError(404, 'not_found', `No lot ${params.code}.`);
		return json(found);
	});
