/**
 * How work flows: WIP by stage now, time in each stage (median and 90th percentile) for the
 * units that left it in a period, throughput per week, lead time from received to packed, the
 * stage that limits the shop, and Little's law as a check on the figures.
 *
 * A unit's history is a chain of segments: each event starts a segment in its `to_state` that
 * lasts until the unit's next event (a window function). A segment belongs to the stage its
 * state waits for (`STAGE_INFO[stage].input`). Quantiles are found in SQL by rank (the two
 * order statistics of Hyndman & Fan definition 7), so only a handful of rows leave the database.
 */
import { sql, type SQL, type SQLWrapper } from 'drizzle-orm';
import { littleCheck, type LittleCheck } from '../../domain/stats/littles-law';
import { interpolate, quantileRanks } from '../../domain/stats/percentile';
import { STAGE_INFO, STAGES, type Stage } from '../../domain/units/states';
import type { DbOrTx } from '../db';
import { weekOfMs } from '../db/report-sql';
import { station, unit, unitEvent } from '../db/schema';

export const DAY_MS = 86_400_000;

export interface FlowPeriod {
	fromMs: number;
	toMs: number;
}

export interface StageFlow {
	stage: Stage;
	label: string;
	stations: number;
	wipNow: number;
	heldNow: number;
	/** Units that left the stage in the period. */
	completed: number;
	throughputPerDay: number;
	/** Days in the stage, for the units that left it in the period. */
	meanDays: number | null;
	medianDays: number | null;
	p90Days: number | null;
	/** Time-averaged units in the stage over the period. */
	avgWip: number;
	/** Average units in the stage per active station over the period. */
	loadPerStation: number | null;
	little: LittleCheck;
}

export interface FlowReport {
	period: { from: string; to: string; days: number };
	stages: StageFlow[];
	throughputByWeek: { week: string; shipped: number }[];
	leadTime: { packed: number; medianDays: number | null; p90Days: number | null; histogram: { fromDays: number; toDays: number; units: number }[] };
	limiting: { longestQueue: Stage | null; highestLoad: Stage | null };
}

/** CASE expression mapping a state column to the stage it waits for. */
export function stageOfState(column: SQLWrapper): SQL<Stage | null> {
	const whens = STAGES.flatMap((s) => STAGE_INFO[s].input.map((state) => sql`when ${state} then ${s}`));
	return sql<Stage | null>`(case ${column} ${sql.join(whens, sql` `)} else null end)`;
}

const Q = [0.5, 0.9] as const;

/** Quantiles from rows (group, rn, cnt, value) holding the order statistics definition 7 needs. */
function quantilesFromRanks(rows: { g: string; rn: number; cnt: number; v: number }[], q: number): Map<string, number> {
	const byGroup = new Map<string, Map<number, number>>();
	const counts = new Map<string, number>();
	for (const r of rows) {
		(byGroup.get(r.g) ?? byGroup.set(r.g, new Map()).get(r.g)!).set(r.rn, r.v);
		counts.set(r.g, r.cnt);
	}
	const out = new Map<string, number>();
	for (const [g, ranks] of byGroup) {
		const { lo, hi, weight } = quantileRanks(counts.get(g)!, q);
		out.set(g, interpolate(ranks.get(lo)!, ranks.get(hi)!, weight));
	}
	return out;
}

/** SQL condition: this rank is one of the order statistics definition 7 uses for any of Q. */
function rankNeeded(rn: SQL, cnt: SQL): SQL {
	const parts = Q.map((q) => sql`${rn} in (cast((${cnt} - 1) * ${q} as integer) + 1, min(${cnt}, cast((${cnt} - 1) * ${q} as integer) + 2))`);
	return sql.join(parts, sql` or `);
}

export function flowReport(db: DbOrTx, period: FlowPeriod, now: number = Date.now()): FlowReport {
	const { fromMs, toMs } = period;
	const span = Math.max(1, toMs - fromMs);
	const days = span / DAY_MS;
	const endCap = Math.min(now, toMs);

	const segments = sql`select ${unitEvent.unitId} as unit_id, ${stageOfState(unitEvent.toState)} as stage, ${unitEvent.at} as s,
		lead(${unitEvent.at}) over (partition by ${unitEvent.unitId} order by ${unitEvent.seq}) as e from ${unitEvent}`;

	// Time-averaged WIP: each segment's overlap with the period (open segments run until now).
	const avg = db.all<{ stage: Stage; unitMs: number }>(sql`
		with seg as (${segments})
		select stage, sum(max(0, min(coalesce(e, ${endCap}), ${toMs}) - max(s, ${fromMs}))) as unitMs
		from seg where stage is not null and s < ${toMs} and coalesce(e, ${endCap}) > ${fromMs}
		group by stage`);

	// Per unit and stage: total closed time in the stage, when it left, and whether it is still there.
	const perUnit = sql`with seg as (${segments}),
		per as (select unit_id, stage, sum(e - s) as dur, max(e) as left_at, sum(case when e is null then 1 else 0 end) as open
		        from seg where stage is not null group by unit_id, stage),
		done as (select stage, dur from per where open = 0 and left_at >= ${fromMs} and left_at < ${toMs})`;
	const done = db.all<{ stage: Stage; n: number; total: number }>(sql`${perUnit} select stage, count(*) as n, sum(dur) as total from done group by stage`);
	const ranked = db.all<{ g: string; rn: number; cnt: number; v: number }>(sql`${perUnit},
		r as (select stage, dur, row_number() over (partition by stage order by dur) as rn, count(*) over (partition by stage) as cnt from done)
		select stage as g, rn, cnt, dur as v from r where ${rankNeeded(sql`rn`, sql`cnt`)}`);
	const med = quantilesFromRanks(ranked, 0.5);
	const p90 = quantilesFromRanks(ranked, 0.9);

	const wip = db.all<{ stage: Stage; n: number; held: number }>(sql`
		select ${stageOfState(unit.state)} as stage, count(*) as n, sum(case when ${unit.held} then 1 else 0 end) as held
		from ${unit} group by stage having stage is not null`);
	const stations = db.all<{ stage: Stage; n: number }>(sql`select ${station.stage} as stage, count(*) as n from ${station} where ${station.active} group by ${station.stage}`);

	const stages: StageFlow[] = STAGES.map((stage) => {
		const d = done.find((x) => x.stage === stage);
		const completed = d?.n ?? 0;
		const throughputPerDay = completed / days;
		const meanDays = completed ? d!.total / completed / DAY_MS : null;
		const avgWip = (avg.find((x) => x.stage === stage)?.unitMs ?? 0) / span;
		const n = stations.find((x) => x.stage === stage)?.n ?? 0;
		const m = med.get(stage);
		const p = p90.get(stage);
		return {
			stage,
			label: STAGE_INFO[stage].label,
			stations: n,
			wipNow: wip.find((x) => x.stage === stage)?.n ?? 0,
			heldNow: wip.find((x) => x.stage === stage)?.held ?? 0,
			completed,
			throughputPerDay,
			meanDays,
			medianDays: m === undefined ? null : m / DAY_MS,
			p90Days: p === undefined ? null : p / DAY_MS,
			avgWip,
			loadPerStation: n ? avgWip / n : null,
			little: littleCheck(avgWip, throughputPerDay, meanDays ?? 0)
		};
	});

	const throughputByWeek = db.all<{ week: string; shipped: number }>(sql`
		select ${weekOfMs(unitEvent.at)} as week, count(*) as shipped from ${unitEvent}
		where ${unitEvent.action} = 'ship' and ${unitEvent.at} >= ${fromMs} and ${unitEvent.at} < ${toMs}
		group by week order by week`);

	const lead = sql`with lt as (
		select p.unit_id, p.at - r.at as dur from
		  (select ${unitEvent.unitId} as unit_id, max(${unitEvent.at}) as at from ${unitEvent} where ${unitEvent.action} = 'pack' group by ${unitEvent.unitId}) p
		  join (select ${unitEvent.unitId} as unit_id, min(${unitEvent.at}) as at from ${unitEvent} where ${unitEvent.action} = 'receive' group by ${unitEvent.unitId}) r
		  on r.unit_id = p.unit_id
		where p.at >= ${fromMs} and p.at < ${toMs})`;
	const hist = db.all<{ bin: number; n: number }>(sql`${lead} select cast(dur / ${7 * DAY_MS} as integer) as bin, count(*) as n from lt group by bin order by bin`);
	const leadRanks = db.all<{ g: string; rn: number; cnt: number; v: number }>(sql`${lead},
		r as (select dur, row_number() over (order by dur) as rn, count(*) over () as cnt from lt)
		select 'all' as g, rn, cnt, dur as v from r where ${rankNeeded(sql`rn`, sql`cnt`)}`);
	const packed = hist.reduce((s, h) => s + h.n, 0);
	const lm = quantilesFromRanks(leadRanks, 0.5).get('all');
	const lp = quantilesFromRanks(leadRanks, 0.9).get('all');

	const pick = (key: (s: StageFlow) => number | null) => {
		let best: StageFlow | null = null;
		for (const s of stages) if ((key(s) ?? 0) > 0 && (!best || key(s)! > key(best)!)) best = s;
		return best?.stage ?? null;
	};

	return {
		period: { from: new Date(fromMs).toISOString().slice(0, 10), to: new Date(toMs - 1).toISOString().slice(0, 10), days },
		stages,
		throughputByWeek,
		leadTime: {
			packed,
			medianDays: lm === undefined ? null : lm / DAY_MS,
			p90Days: lp === undefined ? null : lp / DAY_MS,
			histogram: hist.map((h) => ({ fromDays: h.bin * 7, toDays: h.bin * 7 + 7, units: h.n }))
		},
		limiting: { longestQueue: pick((s) => s.wipNow), highestLoad: pick((s) => s.loadPerStation) }
	};
}

/** A period from URL dates (inclusive days, UTC); defaults to the 28 days up to today. */
export function flowPeriod(from: string | undefined, to: string | undefined, now = Date.now()): FlowPeriod {
	const today = Date.UTC(new Date(now).getUTCFullYear(), new Date(now).getUTCMonth(), new Date(now).getUTCDate());
	const toMs = to ? Date.parse(`${to}T00:00:00Z`) + DAY_MS : today + DAY_MS;
	const fromMs = from ? Date.parse(`${from}T00:00:00Z`) : toMs - 28 * DAY_MS;
	return { fromMs, toMs };
}
