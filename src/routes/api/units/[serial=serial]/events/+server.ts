import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, readJson } from '$lib/server/http';
import { applyMove, scanAtStation } from '$lib/server/units';
import { z } from 'zod';
import { MOVE_BODY_LIMITS, idempotencyKeySchema, moveRequestSchema, stationCodeSchema } from '$lib/move-request';
import { strictObject } from '$lib/domain/input/fields';
import type { ActionName } from '$lib/domain/units/actions';
import type { RequestHandler } from './$types';

/** A scan at a station: the station's main move for the unit's state (`mainAction`). */
const scanRequestSchema = strictObject(
	{
		idempotencyKey: idempotencyKeySchema,
		scan: z.literal(true, { error: 'A scan says scan: true.' }),
		stationCode: stationCodeSchema
	},
	'A scan'
);

export const POST: RequestHandler = async ({ params, request, locals }) => {
	const user = locals.user!;
	if (request.headers.get('x-spoolyard-scan') === '1') {
		const scan = await readJson(request, scanRequestSchema, MOVE_BODY_LIMITS);
		if (!scan.ok) return scan.response;
		const result = scanAtStation(getDb(), { id: user.id, role: user.role }, scan.data.stationCode, params.serial, scan.data.idempotencyKey);
		if (!result.ok) {
			return apiError(result.status, result.code, result.message, {
				...(result.fields ? { fields: result.fields } : {}),
				...(result.unit ? { unit: result.unit } : {})
			});
		}
		return json({ unit: result.unit, event: result.event, replayed: result.replayed }, { status: result.status });
	}
	const body = await readJson(request, moveRequestSchema, MOVE_BODY_LIMITS);
	if (!body.ok) return body.response;
	const result = applyMove(getDb(), { id: user.id, role: user.role }, {
		serial: params.serial,
		...body.data,
		action: body.data.action as ActionName
	});
	if (!result.ok) {
		return apiError(result.status, result.code, result.message, {
			...(result.fields ? { fields: result.fields } : {}),
			...(result.unit ? { unit: result.unit } : {})
		});
	}
	return json({ unit: result.unit, event: result.event, replayed: result.replayed }, { status: result.status });
};
