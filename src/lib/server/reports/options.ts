/** Choices for the report filters: suppliers and models. */
import { asc } from 'drizzle-orm';
import type { DbOrTx } from '../db';
import { supplier, turboModel } from '../db/schema';

export function reportOptions(db: DbOrTx) {
	return {
		suppliers: db.select({ id: supplier.id, name: supplier.name }).from(supplier).orderBy(asc(supplier.name)).all(),
		models: db.select({ code: turboModel.code }).from(turboModel).orderBy(asc(turboModel.code)).all().map((m) => m.code)
	};
}
