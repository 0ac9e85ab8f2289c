import { getDb } from '$lib/server/db';
import { finishedStock, wipByModel } from '$lib/server/stock';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	return { stock: finishedStock(db), wip: wipByModel(db) };
};
