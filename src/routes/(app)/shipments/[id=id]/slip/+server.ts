import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { shipmentDetail } from '$lib/server/shipments';
import { packingSlipPdf } from '$lib/server/packing-slip';
import { getRebuildSettings } from '$lib/server/rebuild-settings';
import type { RequestHandler } from './$types';

/** The packing slip; a customer's or web buyer's address only on the slip of a role that may see customers. */
export const GET: RequestHandler = async ({ params, locals }) => {
	const db = getDb();
	const found = shipmentDetail(db, Number(params.id), locals.user!.role);
	if (!found) error(404, { message: 'No such shipment.' });
	const pdf = await packingSlipPdf(found, getRebuildSettings(db).shopName);
	return new Response(Buffer.from(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="packing-slip-${found.shipment.code}.pdf"`,
			'cache-control': 'no-store'
		}
	});
};
