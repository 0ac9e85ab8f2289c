/**
 * The build plan: per model, weekly demand from orders, a smoothed forecast (single smoothing at
 * the owner's α, or smoothing with a trend when that follows the model's history better),
 * finished stock,
 * WIP as equivalent units, open orders → this week's suggested build and the lots whose
 * waiting cores can feed it. The arithmetic is in src/lib/domain/plan/.
 */
import { and, asc, eq, gte, inArray, isNull, lt, ne, sql } from 'drizzle-orm';
import { weeklyDemand } from '../domain/plan/build-plan';
import { planModelWithMethod, type MethodPlanResult } from '../domain/plan/plan-with-method';
import { addDays, pastWeeks, weekStart } from '../domain/plan/weeks';
import type { UnitState } from '../domain/units/states';
import type { Db, DbOrTx } from './db';
import { coreLot, customerOrder, orderLine, planSetting, priorityCardUnit, turboModel, unit } from './db/schema';
import { createCard, type CardResult } from './cards';
import { finishedStock, wipByModel } from './stock';
import type { Actor } from './units';

export const DEFAULT_ALPHA = 0.3;
export const HISTORY_WEEKS = 12;
/** Cores that can feed a build: received, not yet torn down or accepted, not held, not scrapped. */
export const FEED_STATES: readonly UnitState[] = ['received', 'inspected'];

export function getAlpha(db: DbOrTx): number {
	return db.select({ v: planSetting.value }).from(planSetting).where(eq(planSetting.name, 'ses_alpha')).get()?.v ?? DEFAULT_ALPHA;
}

export function setAlpha(db: Db, actor: Actor, value: number, now = new Date()): { ok: true } | { ok: false; message: string } {
	if (actor.role !== 'owner') return { ok: false, message: 'Only the owner sets the smoothing constant.' };
	if (!Number.isFinite(value) || value < 0.01 || value > 1) return { ok: false, message: 'α must be between 0.01 and 1.' };
	db.insert(planSetting)
		.values({ name: 'ses_alpha', value, updatedBy: actor.id, updatedAt: now })
		.onConflictDoUpdate({ target: planSetting.name, set: { value, updatedBy: actor.id, updatedAt: now } })
		.run();
	return { ok: true };
}

export interface ModelPlan extends MethodPlanResult {
	model: string;
	weeks: string[];
	history: number[];
	finished: number;
	wip: { state: UnitState; count: number }[];
	wipUnits: number;
	openDue: number;
	openAll: number;
	feed: { lot: string; receivedOn: string; cores: number }[];
	feedCores: number;
}

export interface BuildPlan {
	alpha: number;
	today: string;
	weekStart: string;
	weekEnd: string;
	models: ModelPlan[];
}

export function buildPlan(db: DbOrTx, now = new Date(), onlyModel?: string): BuildPlan {
	const today = now.toISOString().slice(0, 10);
	const weeks = pastWeeks(today, HISTORY_WEEKS);
	const thisWeek = weekStart(today);
	const weekEnd = addDays(thisWeek, 6);
	const alpha = getAlpha(db);
	const models = db
		.select({ id: turboModel.id, code: turboModel.code })
		.from(turboModel)
		.where(and(eq(turboModel.active, true), onlyModel ? eq(turboModel.code, onlyModel) : undefined))
		.orderBy(asc(turboModel.code))
		.all();

	const byDay = db
		.select({ modelId: orderLine.modelId, day: customerOrder.orderedOn, qty: sql<number>`sum(${orderLine.quantity})` })
		.from(orderLine)
		.innerJoin(customerOrder, eq(customerOrder.id, orderLine.orderId))
		.where(and(ne(customerOrder.status, 'cancelled'), gte(customerOrder.orderedOn, weeks[0]), lt(customerOrder.orderedOn, thisWeek)))
		.groupBy(orderLine.modelId, customerOrder.orderedOn)
		.all();
	const openRows = db
		.select({
			modelId: orderLine.modelId,
			due: sql<number>`sum(case when ${customerOrder.dueOn} is null or ${customerOrder.dueOn} <= ${weekEnd} then ${orderLine.quantity} else 0 end)`,
			all: sql<number>`sum(${orderLine.quantity})`
		})
		.from(orderLine)
		.innerJoin(customerOrder, eq(customerOrder.id, orderLine.orderId))
		.where(eq(customerOrder.status, 'open'))
		.groupBy(orderLine.modelId)
		.all();
	const stock = new Map(finishedStock(db).map((s) => [s.model, s.count - s.held]));
	const wip = wipByModel(db, onlyModel);
	const feedRows = db
		.select({ modelId: unit.modelId, lot: coreLot.code, receivedOn: coreLot.receivedOn, cores: sql<number>`count(*)` })
		.from(unit)
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.where(and(inArray(unit.state, [...FEED_STATES]), eq(unit.held, false)))
		.groupBy(unit.modelId, coreLot.code, coreLot.receivedOn)
		.orderBy(asc(coreLot.receivedOn), asc(coreLot.code))
		.all();

	return {
		alpha,
		today,
		weekStart: thisWeek,
		weekEnd,
		models: models.map((m) => {
			const history = weeklyDemand(weeks, byDay.filter((d) => d.modelId === m.id).map((d) => ({ week: weekStart(d.day), quantity: d.qty })));
			const open = openRows.find((o) => o.modelId === m.id);
			const ownWip = wip.filter((w) => w.model === m.code).map(({ state, count }) => ({ state, count }));
			const finished = stock.get(m.code) ?? 0;
			const openDue = open?.due ?? 0;
			const plan = planModelWithMethod({ history, alpha, finished, wip: ownWip, openDue });
			const feed = feedRows.filter((f) => f.modelId === m.id).map(({ lot, receivedOn, cores }) => ({ lot, receivedOn, cores }));
			return {
				model: m.code,
				weeks,
				history,
				finished,
				wip: ownWip,
				wipUnits: ownWip.reduce((a, w) => a + w.count, 0),
				openDue,
				openAll: open?.all ?? 0,
				feed,
				feedCores: feed.reduce((a, f) => a + f.cores, 0),
				...plan
			};
		})
	};
}

/**
 * Turn a model's suggestion into a units card: the oldest waiting cores of that model (from
 * the oldest lots first, none that are already on a card), as many as the suggestion, due at
 * the end of this week.
 */
export function suggestionToCard(db: Db, actor: Actor, modelCode: string, now = new Date()): CardResult & { short?: number } {
	const whole = buildPlan(db, now, modelCode);
	const plan = whole.models[0];
	if (!plan) return { ok: false, status: 404, code: 'not_found', message: `There is no model ${modelCode}.` };
	if (plan.suggested <= 0) return { ok: false, status: 400, code: 'invalid', message: `Nothing to build for ${modelCode} this week: stock and work in progress cover the demand.` };
	const cores = db
		.select({ serial: unit.serial })
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.leftJoin(priorityCardUnit, eq(priorityCardUnit.unitId, unit.id))
		.where(and(eq(turboModel.code, modelCode), inArray(unit.state, [...FEED_STATES]), eq(unit.held, false), isNull(priorityCardUnit.unitId)))
		.orderBy(asc(coreLot.receivedOn), asc(unit.stateSince), asc(unit.id))
		.limit(plan.suggested)
		.all();
	if (cores.length === 0) return { ok: false, status: 400, code: 'invalid', message: `No waiting ${modelCode} cores are free to feed this build; receive a lot first.` };
	const result = createCard(db, actor, {
		title: `Build ${cores.length} × ${modelCode} this week`,
		style: 'restock',
		kind: 'units',
		dueOn: whole.weekEnd,
		serials: cores.map((c) => c.serial).join(' ')
	}, now);
	return result.ok ? { ...result, short: plan.suggested - cores.length } : result;
}


