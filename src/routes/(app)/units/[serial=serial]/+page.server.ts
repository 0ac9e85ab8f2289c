import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { getUnitWithHistory } from '$lib/server/units';
import { benchContext } from '$lib/server/balance';
import { unitInspectionData } from '$lib/server/inspections';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const found = getUnitWithHistory(getDb(), params.serial);
	if (!found) error(404, { message: `No unit ${params.serial} in the shop.` });
	return { ...found, build: benchContext(getDb(), params.serial)!.record, ...unitInspectionData(getDb(), params.serial) };
};
