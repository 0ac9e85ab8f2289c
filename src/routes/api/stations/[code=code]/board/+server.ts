import { json } from '@sveltejs/kit';
import { stationBoard } from '$lib/server/board';
import { getDb } from '$lib/server/db';
import { apiError } from '$lib/server/http';
import type { RequestHandler } from './$types';

/** The station's board: waiting, in work here, done here today, with counts and ages. */
export const GET: RequestHandler = async ({ params }) => {
	const board = stationBoard(getDb(), params.code);
	if (!board) return apiError(404, 'not_found', `No station ${params.code}.`);
	return json(board, { headers: { 'cache-control': 'no-store' } });
};
