/**
 * SQLite flow query: the median time units took from first entering one state to first
 * entering a later one, over units that reached the later state since `sinceMs`.
 * Median of an even count is the mean of the two middle values.
 */
import { sql } from 'drizzle-orm';
import type { DbOrTx } from './index';

export function medianTimeBetweenStates(
	db: DbOrTx,
	fromState: string,
	toState: string,
	sinceMs: number
): { medianMs: number | null; n: number } {
	const row = db.get<{ median: number | null; n: number | null }>(sql`
		with entered as (
			select unit_id, min(at) as t from unit_event where to_state = ${fromState} group by unit_id
		), reached as (
			select unit_id, min(at) as t from unit_event where to_state = ${toState} group by unit_id
		), d as (
			select r.t - e.t as ms from entered e join reached r on r.unit_id = e.unit_id
			where r.t >= e.t and r.t >= ${sinceMs}
		), o as (
			select ms, row_number() over (order by ms) as rn, count(*) over () as n from d
		)
		select avg(ms) as median, max(n) as n from o where rn in ((n + 1) / 2, (n + 2) / 2)
	`);
	return { medianMs: row?.median ?? null, n: row?.n ?? 0 };
}
