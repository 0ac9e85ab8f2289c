/** Stations and what waits at them. */
import { and, asc, desc, eq, gte, inArray, sql } from 'drizzle-orm';
import type { CardStyleKey } from '../domain/cards/card-style';
import { cardIdForUnit } from './card-match';
import { STAGE_INFO, STAGES, type Stage } from '../domain/units/states';
import type { DbOrTx } from './db';
import { coreLot, priorityCard, station, turboModel, unit, unitEvent, type Station } from './db/schema';

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

/** Units waiting for this station's stage, in queue order: card rank, card due date, then the oldest; no card last. */
export function stationQueue(db: DbOrTx, stage: Stage, limit = 100): { items: QueueItem[]; total: number } {
	const states = [...STAGE_INFO[stage].input];
	const cond = inArray(unit.state, states);
	const total = db.select({ n: sql<number>`count(*)` }).from(unit).where(cond).get()?.n ?? 0;
	const items = db
		.select({
			serial: unit.serial,
			originalTag: unit.originalTag,
			state: unit.state,
			held: unit.held,
			holdReason: unit.holdReason,
			model: turboModel.code,
			lot: coreLot.code,
			priority: unit.priority,
			stateSince: unit.stateSince,
			version: unit.version,
			cardId: priorityCard.id,
			cardTitle: priorityCard.title,
			cardStyle: priorityCard.style
		})
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.leftJoin(priorityCard, eq(priorityCard.id, cardIdForUnit(db, stage)))
		.where(cond)
		.orderBy(
			sql`${priorityCard.id} is null`,
			asc(priorityCard.rank),
			sql`${priorityCard.dueOn} is null`,
			asc(priorityCard.dueOn),
			asc(priorityCard.id),
			asc(unit.stateSince),
			asc(unit.id)
		)
		.limit(limit)
		.all();
	return {
		items: items.map(({ cardId, cardTitle, cardStyle, ...r }) => ({
			...r,
			stateSince: r.stateSince.toISOString(),
			card: cardId !== null ? { id: cardId, title: cardTitle!, style: cardStyle! } : null
		})),
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
