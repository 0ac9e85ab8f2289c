import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { getDb } from '$lib/server/db';
import { apiError, readJson } from '$lib/server/http';
import { undoLastMove } from '$lib/server/undo';
import type { RequestHandler } from './$types';

const undoSchema = z.object({
	seq: z.number().int().positive().optional(),
	stationCode: z.string().trim().min(1).max(40).nullable().optional(),
	idempotencyKey: z
		.string({ error: 'Send an idempotency key.' })
		.min(8, 'The idempotency key must be 8 to 100 characters.')
		.max(100, 'The idempotency key must be 8 to 100 characters.')
		.regex(/^[\w:.-]+$/, 'The idempotency key may hold letters, digits, and : . _ - only.')
});

/** Undo the caller's own last move on the unit (within the undo window). */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const user = locals.user!;
	const body = await readJson(request, undoSchema);
	if (!body.ok) return body.response;
	const result = undoLastMove(getDb(), { id: user.id, role: user.role }, { serial: params.serial, ...body.data });
	if (!result.ok) return apiError(result.status, result.code, result.message, result.unit ? { unit: result.unit } : {});
	return json(result, { status: result.status });
};
