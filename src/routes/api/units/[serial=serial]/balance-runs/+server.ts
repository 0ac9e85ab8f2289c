import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { getDb } from '$lib/server/db';
import { benchContext, recordBalanceRun } from '$lib/server/balance';
import { apiError, readJson } from '$lib/server/http';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const ctx = benchContext(getDb(), params.serial);
	if (!ctx) return apiError(404, 'not_found', `No unit ${params.serial} in the shop.`);
	return json({ runs: ctx.record.runs, currentBuild: ctx.currentRuns.map((r) => r.runNo) });
};

/** Record a run: the body is the run (see balanceRunInput) plus an optional stationCode. */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const body = await readJson(request, z.record(z.string(), z.unknown()));
	if (!body.ok) return body.response;
	const user = locals.user!;
	const { stationCode, ...run } = body.data;
	const r = recordBalanceRun(getDb(), { id: user.id, role: user.role }, params.serial, run, {
		stationCode: typeof stationCode === 'string' ? stationCode : null
	});
	if (!r.ok) return apiError(r.status, r.status === 400 ? 'invalid' : r.status === 403 ? 'forbidden' : r.status === 404 ? 'not_found' : 'refused', r.message, r.fields ? { fields: r.fields } : {});
	return json({ run: r.record.run, evaluation: r.record.evaluation }, { status: 201 });
};
