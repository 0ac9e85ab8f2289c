import { getDb } from '$lib/server/db';
import { listStations } from '$lib/server/stations';
import { countByState } from '$lib/server/summary';
import { driftReport } from '$lib/server/reports/drift';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const db = getDb();
	const role = locals.user?.role;
	// the balancer's state for those who steer the floor (the drift report's own audience)
	const drift = role === 'owner' || role === 'lead' ? driftReport(db) : null;
	return {
		counts: countByState(db),
		stations: listStations(db),
		drift: drift ? { drifting: drift.drifting, sentence: drift.sentence, units: drift.points.length } : null
	};
};
