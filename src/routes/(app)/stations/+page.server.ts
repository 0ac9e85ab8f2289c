import { getDb } from '$lib/server/db';
import { listStations, stationQueue } from '$lib/server/stations';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	const stations = listStations(db).map((s) => ({ ...s, waiting: stationQueue(db, s.stage, 1).total }));
	return { stations };
};
