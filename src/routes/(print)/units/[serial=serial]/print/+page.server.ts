import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { unitRecord } from '$lib/server/unit-record';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const record = unitRecord(getDb(), params.serial);
	if (!record) error(404, { message: `No unit ${params.serial} in the shop.` });
	return { record, printedAt: new Date().toISOString(), printedBy: locals.user!.name };
};
