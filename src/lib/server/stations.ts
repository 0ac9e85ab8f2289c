/** Stations and what waits at them. */
import { and, asc, desc, eq, gte, inArray, not, or, sql, type SQL } from 'drizzle-orm';
import type { CardStyleKey } from '../domain/cards/card-style';
import { compareCards } from '../domain/queue-order';
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
 * What a card takes in the queue of `stage`, as a condition on the unit row (the SQL twin of
 * `cardTakes` in src/lib/domain/queue-order.ts); null when it takes nothing there.
 */
function cardCondition(c: typeof priorityCard.$inferSelect, stage: Stage): SQL | null {
	if (!c.open) return null;
	if (c.kind === 'units') return inArray(unit.id, sql`(select ${priorityCardUnit.unitId} from ${priorityCardUnit} where ${priorityCardUnit.cardId} = ${c.id})`);
	if (c.ruleModelId === null && c.ruleStage === null && c.ruleLotId === null) return null;
	if (c.ruleStage !== null && c.ruleStage !== stage) return null;
	const rule: SQL[] = [];
	if (c.ruleModelId !== null) rule.push(eq(unit.modelId, c.ruleModelId));
	if (c.ruleLotId !== null) rule.push(eq(unit.lotId, c.ruleLotId));
	return rule.length ? and(...rule)! : sql`1 = 1`; // a card for the whole stage takes every unit
}

const queueColumns = {
	id: unit.id,
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
				.select(queueColumns)
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
 * oldest; no card last (src/lib/domain/queue-order.ts). The open cards are walked in board
 * order, each read taking the oldest units that card takes and no earlier card does, until the
 * page is full; then the oldest of the rest, straight from the (state, state_since) index. The
 * length comes from `state_tally` (kept by triggers), so a queue of a hundred thousand units
 * costs what a queue of a hundred does, and a card over a whole model costs one short read.
 */
export function stationQueue(db: DbOrTx, stage: Stage, limit = 100): { items: QueueItem[]; total: number } {
	const states = [...STAGE_INFO[stage].input];
	const cond = inArray(unit.state, states);
	const total = q.unitsIn(db).get({ s1: states[0], s2: states[1] ?? states[0] })?.n ?? 0;
	const cards = q
		.openCards(db)
		.all()
		.map((card) => ({ card, takes: cardCondition(card, stage) }))
		.filter((c): c is { card: typeof c.card; takes: SQL } => c.takes !== null)
		.sort((a, b) => compareCards(a.card, b.card));
	const items: QueueItem[] = [];
	const earlier: SQL[] = [];
	const notEarlier = () => (earlier.length ? [not(or(...earlier)!)] : []);
	const page = (where: SQL, n: number) =>
		db
			.select(queueColumns)
			.from(unit)
			.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
			.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
			.where(where)
			.orderBy(asc(unit.stateSince), asc(unit.id))
			.limit(n)
			.all();
	for (const { card, takes } of cards) {
		if (items.length >= limit) break;
		for (const { id: _id, ...r } of page(and(cond, takes, ...notEarlier())!, limit - items.length))
			items.push({ ...r, stateSince: r.stateSince.toISOString(), card: { id: card.id, title: card.title, style: card.style } });
		earlier.push(takes);
	}
	// The oldest of the rest: one index range per state, merged.
	const want = limit - items.length;
	if (want > 0) {
		const rest = states
			.flatMap((st) => (earlier.length ? page(and(eq(unit.state, st), ...notEarlier())!, want) : q.oldest(db).all({ state: st, limit: want })))
			.sort((a, b) => a.stateSince.getTime() - b.stateSince.getTime() || a.id - b.id)
			.slice(0, want);
		for (const { id: _id, ...r } of rest) items.push({ ...r, stateSince: r.stateSince.toISOString(), card: null });
	}
	return { items, total };
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
