/**
 * The SQL side of src/lib/domain/queue-order.ts: for a unit row in a query, the id of the open
 * card it is on in the queue of `stage` (best rank, then due date, then id), as a correlated
 * subquery. Open cards are few, and the subquery walks them by the (open, rank) index; the
 * units card a unit is on is found by the unit's primary key in priority_card_unit.
 */
import { and, asc, eq, isNotNull, isNull, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { Stage } from '../domain/units/states';
import type { DbOrTx } from './db';
import { priorityCard, priorityCardUnit, unit } from './db/schema';

export function cardIdForUnit(db: DbOrTx, stage: Stage | null): SQL<number | null> {
	const c = alias(priorityCard, 'qc');
	const cu = alias(priorityCardUnit, 'qcu');
	const sub = db
		.select({ id: c.id })
		.from(c)
		.leftJoin(cu, and(eq(cu.cardId, c.id), eq(cu.unitId, unit.id)))
		.where(
			and(
				eq(c.open, true),
				or(
					and(eq(c.kind, 'units'), isNotNull(cu.unitId)),
					and(
						eq(c.kind, 'rule'),
						or(isNotNull(c.ruleModelId), isNotNull(c.ruleStage), isNotNull(c.ruleLotId)),
						or(isNull(c.ruleModelId), eq(c.ruleModelId, unit.modelId)),
						stage === null ? isNull(c.ruleStage) : or(isNull(c.ruleStage), eq(c.ruleStage, stage)),
						or(isNull(c.ruleLotId), eq(c.ruleLotId, unit.lotId))
					)
				)
			)
		)
		.orderBy(asc(c.rank), sql`${c.dueOn} is null`, asc(c.dueOn), asc(c.id))
		.limit(1);
	return sql<number | null>`(${sub})`;
}
