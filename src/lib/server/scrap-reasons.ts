import { asc, eq } from 'drizzle-orm';
import type { DbOrTx } from './db';
import { scrapReason } from './db/schema';

export function listScrapReasons(db: DbOrTx) {
	return db
		.select({ code: scrapReason.code, label: scrapReason.label, category: scrapReason.category })
		.from(scrapReason)
		.where(eq(scrapReason.active, true))
		.orderBy(asc(scrapReason.category), asc(scrapReason.label))
		.all();
}
