/**
 * Finished stock and work in progress.
 *
 * Finished stock is every packed unit not yet shipped. Its *location* is where it sits: until
 * the shop records shipments or transfers to the depots, every packed unit is on the shop's
 * own shelf, so the one location today is `shop` ("Shop shelf, Pellmarsh"). When shipments
 * exist, a unit sent to a depot but not sold will carry that depot as its location here.
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { WIP_STATES } from '../domain/plan/build-plan';
import type { UnitState } from '../domain/units/states';
import type { DbOrTx } from './db';
import { turboModel, unit } from './db/schema';

export const STOCK_LOCATIONS = { shop: 'Shop shelf, Pellmarsh' } as const;

export interface StockRow {
	model: string;
	location: keyof typeof STOCK_LOCATIONS;
	locationLabel: string;
	count: number;
	/** Of those, on hold (packed but not to be sold yet). */
	held: number;
}

export function finishedStock(db: DbOrTx): StockRow[] {
	return db
		.select({ model: turboModel.code, count: sql<number>`count(*)`, held: sql<number>`sum(case when ${unit.held} then 1 else 0 end)` })
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(unit.state, 'packed'))
		.groupBy(turboModel.code)
		.orderBy(asc(turboModel.code))
		.all()
		.map((r) => ({ model: r.model, location: 'shop' as const, locationLabel: STOCK_LOCATIONS.shop, count: r.count, held: r.held ?? 0 }));
}

export interface WipRow {
	model: string;
	state: UnitState;
	count: number;
}

/** Units on the route before packed, by model and state (the state says which stage they wait for). */
export function wipByModel(db: DbOrTx, modelCode?: string): WipRow[] {
	return db
		.select({ model: turboModel.code, state: unit.state, count: sql<number>`count(*)` })
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(and(inArray(unit.state, [...WIP_STATES]), modelCode ? eq(turboModel.code, modelCode) : undefined))
		.groupBy(turboModel.code, unit.state)
		.orderBy(asc(turboModel.code))
		.all();
}
