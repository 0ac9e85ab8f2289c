import { getDb } from '$lib/server/db';
import { isLotSortKey, listLots, lotsCsv } from '$lib/server/lots';
import type { RequestHandler } from './$types';

/** The lot list as a CSV report, in the order the page shows. */
export const GET: RequestHandler = async ({ url }) => {
	const s = url.searchParams.get('sort');
	const lots = listLots(getDb(), isLotSortKey(s) ? s : 'receivedOn', url.searchParams.get('dir') === 'asc' ? 'asc' : 'desc');
	const day = new Date().toISOString().slice(0, 10);
	return new Response(lotsCsv(lots), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="spoolyard-lots-${day}.csv"`
		}
	});
};
