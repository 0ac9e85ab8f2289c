import { asc, eq } from 'drizzle-orm';
import { getDb } from '$lib/server/db';
import { station, turboModel } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	return {
		stations: db.select({ code: station.code, name: station.name }).from(station).where(eq(station.stage, 'balance')).orderBy(asc(station.code)).all(),
		models: db.select({ code: turboModel.code }).from(turboModel).orderBy(asc(turboModel.code)).all().map((m) => m.code)
	};
};
