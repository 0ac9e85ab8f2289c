import { csvResponse } from '$lib/csv/write';
import { getDb } from '$lib/server/db';
import { isLotSortKey, listLots, lotsCsv } from '$lib/server/lots';
import type { RequestHandler } from './$types';

/** The lot list as a CSV report, in the order the page shows, with the columns the role may see. */
export const GET: RequestHandler = async ({ url, locals }) => {
	const role = locals.user!.role;
	const s = url.searchParams.get('sort');
	const lots = listLots(getDb(), isLotSortKey(s, role) ? s : 'receivedOn', url.searchParams.get('dir') === 'asc' ? 'asc' : 'desc');
	const day = new Date().toISOString().slice(0, 10);
	return csvResponse(lotsCsv(lots, role), `spoolyard-lots-${day}.csv`);
};
