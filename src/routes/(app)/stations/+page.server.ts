import { redirect } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { stationsOf } from '$lib/server/floor-settings';
import { listStations, stationQueue } from '$lib/server/stations';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const db = getDb();
	// a tech's home is their station: one assigned station opens it, several are listed first
	const mine = locals.user ? stationsOf(db, locals.user.id) : [];
	if (locals.user?.role === 'tech' && mine.length === 1 && !url.searchParams.has('all')) redirect(303, `/stations/${mine[0]}`);
	const stations = listStations(db).map((s) => ({ ...s, waiting: stationQueue(db, s.stage, 1).total }));
	return { stations, mine };
};
