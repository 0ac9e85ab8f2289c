import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { getDb } from '$lib/server/db';
import { apiError, readJson } from '$lib/server/http';
import { strictObject } from '$lib/domain/input/fields';
import { MOVE_BODY_LIMITS, idempotencyKeySchema, stationCodeSchema } from '$lib/move-request';
import { undoLastMove } from '$lib/server/undo';
import type { RequestHandler } from './$types';

const undoSchema = strictObject(
	{
		seq: z.number({ error: 'seq is the number of the move to undo.' }).int('seq is a whole number.').positive('seq is a whole number.').optional(),
		stationCode: stationCodeSchema.nullable().optional(),
		idempotencyKey: idempotencyKeySchema
	},
	'An undo'
);

/** Undo the caller's own last move on the unit (within the undo window). */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const user = locals.user!;
	const body = await readJson(request, undoSchema, MOVE_BODY_LIMITS);
	if (!body.ok) return body.response;
	const result = undoLastMove(getDb(), { id: user.id, role: user.role }, { serial: params.serial, ...body.data });
	if (!result.ok) return apiError(result.status, result.code, result.message, result.unit ? { unit: result.unit } : {});
	return json(result, { status: result.status });
};
