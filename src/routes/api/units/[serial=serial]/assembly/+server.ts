import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { getDb } from '$lib/server/db';
import { benchContext, recordAssembly } from '$lib/server/balance';
import { apiError, readJson } from '$lib/server/http';
import { stationCodeSchema } from '$lib/move-request';
import type { RequestHandler } from './$types';

/**
 * The body is the record plus an optional station code; the record's own fields are checked
 * exactly by the service (a key it does not declare is refused, naming it).
 */
const withStation = z
	.record(z.string().max(40, 'Field names are at most 40 characters.'), z.unknown(), { error: 'Send the record as an object of fields.' })
	.refine((r) => Object.keys(r).length <= 20, 'A record has at most 20 fields.')
	.pipe(z.looseObject({ stationCode: stationCodeSchema.nullable().optional() }));

/** A record is a dozen short fields. */
const RECORD_LIMITS = { maxBytes: 8 * 1024, maxDepth: 2 };

export const GET: RequestHandler = async ({ params }) => {
	const ctx = benchContext(getDb(), params.serial);
	if (!ctx) return apiError(404, 'not_found', `No unit ${params.serial} in the shop.`);
	return json({ records: ctx.record.assemblies });
};

/** Record the assembly: the body is the record (see assemblyInput) plus an optional stationCode. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await readJson(request, withStation, RECORD_LIMITS);
	if (!body.ok) return body.response;
	const user = locals.user!;
	const { stationCode, ...rec } = body.data;
	const r = recordAssembly(getDb(), { id: user.id, role: user.role }, params.serial, rec, {
		stationCode: stationCode ?? null
	});
	if (!r.ok) return apiError(r.status, r.status === 400 ? 'invalid' : r.status === 403 ? 'forbidden' : r.status === 404 ? 'not_found' : 'refused', r.message, r.fields ? { fields: r.fields } : {});
	return json({ record: r.record }, { status: 201 });
};
