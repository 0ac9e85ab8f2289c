/** Stations and what waits at them. */
import { and, asc, desc, eq, gte, inArray, not, or, sql, type SQL } from 'drizzle-orm';
import type { CardStyleKey } from '../domain/cards/card-style';
import { cardIdForUnit } from './card-match';
import { prepared } from './db/prepared';
import { STAGE_INFO, STAGES, type Stage } from '../domain/units/states';
import type { DbOrTx } from './db';
import { coreLot, priorityCard, priorityCardUnit, stateTally, station, turboModel, unit, unitEvent, type Station } from './db/schema';

export interface StationView {
	code: string;
	name: string;
	stage: Stage;
	step: number;
	stageLabel: string;
	material: Station['material'];
	overdueHours: number;
}

export function toStationView(s: Station): StationView {
	return {
		code: s.code,
		name: s.name,
		stage: s.stage,
		step: STAGE_INFO[s.stage].step,
		stageLabel: STAGE_INFO[s.stage].label,
		material: s.material,
		overdueHours: s.overdueHours
	};
}

export function listStations(db: DbOrTx): StationView[] {
	const rows = db.select().from(station).where(eq(station.active, true)).orderBy(asc(station.sortOrder), asc(station.id)).all();
	return rows
		.map(toStationView)
		.sort((a, b) => STAGES.indexOf(a.stage) - STAGES.indexOf(b.stage) || 0);
}

export function getStation(db: DbOrTx, code: string): StationView | null {
	const row = db.select().from(station).where(and(eq(station.code, code), eq(station.active, true))).get();
	return row ? toStationView(row) : null;
}

export interface QueueItem {
	serial: string;
	originalTag: string;
	state: string;
	held: boolean;
	holdReason: string | null;
	model: string;
	lot: string;
	priority: number;
	stateSince: string;
	version: number;
	/** The priority card the unit is on here (see src/lib/domain/queue-order.ts), or null. */
	card: { id: number; title: string; style: CardStyleKey } | null;
}

/**
 * Whether some open card takes the unit in the queue of `stage` (the cards given are the open
 * ones that can take units there), as a condition on the unit row; null when none can.
 */
function takenByACard(cards: readonly (typeof priorityCard.$inferSelect)[], stage: Stage): SQL | null {
	const parts: SQL[] = [];
	const listed = cards.filter((c) => c.kind === 'units').map((c) => c.id);
	if (listed.length) parts.push(inArray(unit.id, sqlUnitsOnCards(listed)));
	for (const c of cards) {
		if (c.kind !== 'rule') continue;
		if (c.ruleModelId === null && c.ruleStage === null && c.ruleLotId === null) continue;
		if (c.ruleStage !== null && c.ruleStage !== stage) continue;
		const rule: SQL[] = [];
		if (c.ruleModelId !== null) rule.push(eq(unit.modelId, c.ruleModelId));
		if (c.ruleLotId !== null) rule.push(eq(unit.lotId, c.ruleLotId));
		if (rule.length === 0) return sql`1 = 1`; // a card for the whole stage takes every unit
		parts.push(and(...rule)!);
	}
	return parts.length ? or(...parts)! : null;
}

function sqlUnitsOnCards(cardIds: number[]) {
	return sql`(select ${priorityCardUnit.unitId} from ${priorityCardUnit} where ${inArray(priorityCardUnit.cardId, cardIds)})`;
}

const queueColumns = {
	serial: unit.serial,
	originalTag: unit.originalTag,
	state: unit.state,
	held: unit.held,
	holdReason: unit.holdReason,
	model: turboModel.code,
	lot: coreLot.code,
	priority: unit.priority,
	stateSince: unit.stateSince,
	version: unit.version
};

const ph = sql.placeholder;
const q = {
	openCards: (d: DbOrTx) => prepared(d, 'queue.openCards', (d) => d.select().from(priorityCard).where(eq(priorityCard.open, true)).prepare()),
	unitsIn: (d: DbOrTx) =>
		prepared(d, 'queue.unitsIn', (d) =>
			d
				.select({ n: sql<number>`coalesce(sum(${stateTally.units}), 0)` })
				.from(stateTally)
				.where(inArray(stateTally.state, [ph('s1'), ph('s2')]))
				.prepare()
		),
	oldest: (d: DbOrTx) =>
		prepared(d, 'queue.oldest', (d) =>
			d
				.select({ ...queueColumns, id: unit.id })
				.from(unit)
				.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
				.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
				.where(eq(unit.state, ph('state')))
				.orderBy(asc(unit.stateSince), asc(unit.id))
				.limit(ph('limit'))
				.prepare()
		)
};

/**
 * Units waiting for this station's stage, in queue order: card rank, card due date, then the
 * oldest; no card last (src/lib/domain/queue-order.ts). Two reads: the units some open card
 * takes, each with its best card (few, however long the queue), then the oldest of the rest,
 * straight from the (state, state_since) index; the length comes from `state_tally` (kept by
 * triggers) — so a queue of a hundred thousand units costs what a queue of a hundred does.
 */
export function stationQueue(db: DbOrTx, stage: Stage, limit = 100): { items: QueueItem[]; total: number } {
	const states = [...STAGE_INFO[stage].input];
	const cond = inArray(unit.state, states);
	const total = q.unitsIn(db).get({ s1: states[0], s2: states[1] ?? states[0] })?.n ?? 0;
	const openCards = q.openCards(db).all();
	const taken = takenByACard(openCards, stage);
	const carded = taken
		? db
				.select({ ...queueColumns, cardId: priorityCard.id, cardTitle: priorityCard.title, cardStyle: priorityCard.style })
				.from(unit)
				.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
				.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
				.innerJoin(priorityCard, eq(priorityCard.id, cardIdForUnit(db, stage)))
				.where(and(cond, taken))
				.orderBy(
					asc(priorityCard.rank),
					sql`${priorityCard.dueOn} is null`,
					asc(priorityCard.dueOn),
					asc(priorityCard.id),
					asc(unit.stateSince),
					asc(unit.id)
				)
				.limit(limit)
				.all()
		: [];
	// The oldest of the rest, one index range per state, merged.
	const want = limit - carded.length;
	const rest =
		want > 0
			? states
					.flatMap((st) =>
						taken
							? db
									.select({ ...queueColumns, id: unit.id })
									.from(unit)
									.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
									.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
									.where(and(eq(unit.state, st), not(taken)))
									.orderBy(asc(unit.stateSince), asc(unit.id))
									.limit(want)
									.all()
							: q.oldest(db).all({ state: st, limit: want })
					)
					.sort((a, b) => a.stateSince.getTime() - b.stateSince.getTime() || a.id - b.id)
					.slice(0, want)
					.map(({ id: _id, ...r }) => r)
			: [];
	return {
		items: [
			...carded.map(({ cardId, cardTitle, cardStyle, ...r }) => ({
				...r,
				stateSince: r.stateSince.toISOString(),
				card: { id: cardId, title: cardTitle, style: cardStyle }
			})),
			...rest.map((r) => ({ ...r, stateSince: r.stateSince.toISOString(), card: null }))
		],
		total
	};
}

/** Moves made at a station since `since` (today's work), newest first. */
export function doneAtStation(db: DbOrTx, stationCode: string, since: Date, limit = 50) {
	return db
		.select({ serial: unit.serial, action: unitEvent.action, toState: unitEvent.toState, at: unitEvent.at })
		.from(unitEvent)
		.innerJoin(station, eq(station.id, unitEvent.stationId))
		.innerJoin(unit, eq(unit.id, unitEvent.unitId))
		.where(and(eq(station.code, stationCode), gte(unitEvent.at, since)))
		.orderBy(desc(unitEvent.at))
		.limit(limit)
		.all()
		.map((r) => ({ ...r, at: r.at.toISOString() }));
}
