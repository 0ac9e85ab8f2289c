import { getDb } from '$lib/server/db';
import { listStations } from '$lib/server/stations';
import { countByState } from '$lib/server/summary';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	return { counts: countByState(db), stations: listStations(db) };
};
