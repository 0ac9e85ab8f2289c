import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { getUnitWithHistory } from '$lib/server/units';
import { unitInspectionData } from '$lib/server/inspections';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const found = getUnitWithHistory(getDb(), params.serial);
	if (!found) error(404, { message: `No unit ${params.serial} in the shop.` });
	return { ...found, ...unitInspectionData(getDb(), params.serial) };
};
