/**
 * Whether the balancer drifts: for each balanced build (a unit's latest passing run at one
 * history position), the residual unbalance after correction as a share of the plane's
 * allowance, per plane, in time order. The shares come from SQL; the individuals chart and the
 * run rules are `domain/drift`.
 */
import { and, desc, eq, isNotNull, sql, type SQL } from 'drizzle-orm';
import { driftVerdict, type PlaneDrift } from '../../domain/drift/balancer';
import type { DbOrTx } from '../db';
import { balanceRun, station, turboModel, unit } from '../db/schema';

export const DEFAULT_DRIFT_UNITS = 60;
export const MAX_DRIFT_UNITS = 500;

export interface DriftPoint {
	runId: number;
	serial: string;
	model: string;
	at: number;
	station: string | null;
	comp: number;
	turb: number;
}

export interface DriftReport {
	station: string | null;
	model: string | null;
	last: number;
	points: DriftPoint[];
	planes: PlaneDrift[];
	drifting: boolean;
	sentence: string;
}

/** The latest `last` balanced builds, oldest first. */
export function driftPoints(db: DbOrTx, opts: { station?: string; model?: string; last?: number } = {}): DriftPoint[] {
	const last = Math.min(MAX_DRIFT_UNITS, Math.max(2, opts.last ?? DEFAULT_DRIFT_UNITS));
	const where: SQL[] = [
		eq(balanceRun.passed, true),
		isNotNull(balanceRun.residualCompGmm),
		isNotNull(balanceRun.residualTurbGmm),
		sql`${balanceRun.tolCompGmm} > 0 and ${balanceRun.tolTurbGmm} > 0`,
		// the build's final passing run: no later passing run of the same unit at the same history position
		sql`not exists (select 1 from balance_run later where later.unit_id = ${balanceRun.unitId} and later.after_seq = ${balanceRun.afterSeq} and later.passed = 1 and later.run_no > ${balanceRun.runNo})`
	];
	if (opts.station) where.push(eq(station.code, opts.station));
	if (opts.model) where.push(eq(turboModel.code, opts.model));
	const rows = db
		.select({
			runId: balanceRun.id,
			serial: unit.serial,
			model: turboModel.code,
			at: sql<number>`${balanceRun.at}`.mapWith(Number),
			station: station.name,
			comp: sql<number>`${balanceRun.residualCompGmm} / ${balanceRun.tolCompGmm}`.mapWith(Number),
			turb: sql<number>`${balanceRun.residualTurbGmm} / ${balanceRun.tolTurbGmm}`.mapWith(Number)
		})
		.from(balanceRun)
		.innerJoin(unit, eq(unit.id, balanceRun.unitId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.leftJoin(station, eq(station.id, balanceRun.stationId))
		.where(and(...where))
		.orderBy(desc(balanceRun.at), desc(balanceRun.id))
		.limit(last)
		.all();
	return rows.reverse();
}

export function driftReport(db: DbOrTx, opts: { station?: string; model?: string; last?: number } = {}): DriftReport {
	const points = driftPoints(db, opts);
	const v = driftVerdict({ comp: points.map((p) => p.comp), turb: points.map((p) => p.turb) }, points.map((p) => p.serial));
	return {
		station: opts.station ?? null,
		model: opts.model ?? null,
		last: Math.min(MAX_DRIFT_UNITS, Math.max(2, opts.last ?? DEFAULT_DRIFT_UNITS)),
		points,
		planes: v.planes,
		drifting: v.drifting,
		sentence: v.sentence
	};
}
