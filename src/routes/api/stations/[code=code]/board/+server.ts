import { json } from '@sveltejs/kit';
import { stationBoard } from '$lib/server/board';
import { getDb } from '$lib/server/db';
import { changeStamp } from '$lib/server/db/change-stamp';
import { apiError } from '$lib/server/http';
import type { RequestHandler } from './$types';

/**
 * The station's board: waiting, in work here, done here today, with counts and ages.
 * Boards poll it; its ETag is the database's change stamp, the station and the minute (ages
 * move on with the clock), so an unchanged board answers 304 without being built again.
 */
export const GET: RequestHandler = async ({ params, request }) => {
	const db = getDb();
	const tag = `W/"${changeStamp(db)}.${Math.floor(Date.now() / 60_000)}.${params.code}"`;
	const headers = { 'cache-control': 'private, no-cache', etag: tag, vary: 'cookie' };
	if (request.headers.get('if-none-match') === tag) return new Response(null, { status: 304, headers });
	const board = stationBoard(db, params.code);
	if (!board) return apiError(404, 'not_found', `No station ${params.code}.`);
	return json(board, { headers });
};
