import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, readJson } from '$lib/server/http';
import { applyMove } from '$lib/server/units';
import { moveRequestSchema } from '$lib/move-request';
import type { ActionName } from '$lib/domain/units/actions';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ params, request, locals }) => {
	const user = locals.user!;
	const body = await readJson(request, moveRequestSchema);
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
