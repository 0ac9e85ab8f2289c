/** Counts for the home pages. */
import { sql } from 'drizzle-orm';
import { UNIT_STATES, type UnitState } from '../domain/units/states';
import type { DbOrTx } from './db';
import { unit } from './db/schema';

export function countByState(db: DbOrTx): { state: UnitState; count: number; held: number }[] {
	const rows = db
		.select({
			state: unit.state,
			count: sql<number>`count(*)`,
			held: sql<number>`sum(case when ${unit.held} then 1 else 0 end)`
		})
		.from(unit)
		.groupBy(unit.state)
		.all();
	const by = new Map(rows.map((r) => [r.state, r]));
	return UNIT_STATES.map((state) => ({ state, count: by.get(state)?.count ?? 0, held: by.get(state)?.held ?? 0 }));
}
