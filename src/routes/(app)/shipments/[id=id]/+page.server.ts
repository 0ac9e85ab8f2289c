import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { shipmentDetail } from '$lib/server/shipments';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const found = shipmentDetail(getDb(), Number(params.id), locals.user!.role);
	if (!found) error(404, { message: 'No such shipment.' });
	return found;
};
