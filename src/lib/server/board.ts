/**
 * A station's board: what waits for its stage, what is in work here, what was done here
 * today, each with its count and every unit's age in its state against the station's
 * overdue threshold.
 *
 * "In work here" is a unit that still waits for this station's stage and whose latest history
 * entry was made at this station — at teardown, a unit torn down here that still needs its
 * verdict; elsewhere a unit held, released or undone here. It takes no extra action: the scan
 * that starts the work is the move itself.
 */
import { and, desc, eq, gte, inArray, sql } from 'drizzle-orm';
import { ACTION_INFO, isActionName } from '../domain/units/actions';
import { ageMs, isOverdue } from '../domain/units/stage-time';
import { STAGE_INFO } from '../domain/units/states';
import type { DbOrTx } from './db';
import { coreLot, station, turboModel, unit, unitEvent, user } from './db/schema';
import { prepared } from './db/prepared';
import { stationQueue, toStationView, type QueueItem, type StationView } from './stations';

export interface BoardUnit {
	serial: string;
	model: string;
	lot: string;
	state: string;
	held: boolean;
	holdReason: string | null;
	priority: number;
	stateSince: string;
	ageMs: number;
	overdue: boolean;
	/** A priority card, when the planning side gave the unit one. */
	card?: unknown;
}

export interface DoneItem {
	serial: string;
	action: string;
	done: string;
	toState: string;
	at: string;
	by: string | null;
	seq: number;
}

export interface Board {
	station: StationView;
	waiting: { items: BoardUnit[]; total: number };
	inWork: { items: BoardUnit[]; total: number };
	done: { items: DoneItem[]; total: number };
	at: string;
}

export function startOfDay(now: Date): Date {
	return new Date(now.getFullYear(), now.getMonth(), now.getDate());
}

function toBoardUnit(item: Omit<QueueItem, "card"> & { card?: unknown }, overdueHours: number, now: Date): BoardUnit {
	const out: BoardUnit = {
		serial: item.serial,
		model: item.model,
		lot: item.lot,
		state: item.state,
		held: item.held,
		holdReason: item.holdReason,
		priority: item.priority,
		stateSince: item.stateSince,
		ageMs: ageMs(item.stateSince, now),
		overdue: isOverdue(item.stateSince, now, overdueHours)
	};
	if (item.card !== undefined && item.card !== null) out.card = item.card;
	return out;
}

const ph = sql.placeholder;

/** The board's reads, prepared once per connection (db/prepared.ts). A stage has one or two input states. */
const q = {
	station: (d: DbOrTx) => prepared(d, 'board.station', (d) => d.select().from(station).where(and(eq(station.code, ph('code')), eq(station.active, true))).prepare()),
	inWork: (d: DbOrTx) =>
		prepared(d, 'board.inWork', (d) =>
			d
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
					updatedAt: unit.updatedAt
				})
				.from(unit)
				.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
				.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
				.where(and(eq(unit.lastStationId, ph('stationId')), eq(unit.state, ph('state'))))
				.orderBy(desc(unit.updatedAt))
				.limit(100)
				.prepare()
		),
	inWorkCount: (d: DbOrTx) =>
		prepared(d, 'board.inWorkCount', (d) =>
			d
				.select({ n: sql<number>`count(*)` })
				.from(unit)
				.where(and(eq(unit.lastStationId, ph('stationId')), inArray(unit.state, [ph('s1'), ph('s2')])))
				.prepare()
		),
	done: (d: DbOrTx) =>
		prepared(d, 'board.done', (d) =>
			d
				.select({ serial: unit.serial, action: unitEvent.action, toState: unitEvent.toState, at: unitEvent.at, by: user.name, seq: unitEvent.seq })
				.from(unitEvent)
				.innerJoin(unit, eq(unit.id, unitEvent.unitId))
				.leftJoin(user, eq(user.id, unitEvent.userId))
				.where(and(eq(unitEvent.stationId, ph('stationId')), gte(unitEvent.at, ph('since'))))
				.orderBy(desc(unitEvent.at), desc(unitEvent.id))
				.limit(100)
				.prepare()
		),
	doneCount: (d: DbOrTx) =>
		prepared(d, 'board.doneCount', (d) =>
			d
				.select({ n: sql<number>`count(*)` })
				.from(unitEvent)
				.where(and(eq(unitEvent.stationId, ph('stationId')), gte(unitEvent.at, ph('since'))))
				.prepare()
		)
};

/**
 * Units waiting for this stage whose latest entry was made at this station, most recently
 * changed first (`unit.last_station_id` is kept by a trigger on the history): the newest
 * hundred of each input state straight from the (last station, state, updated) index, merged.
 */
export function inWorkAt(db: DbOrTx, stationId: number, states: readonly string[], limit = 100) {
	if (states.length < 1 || states.length > 2) throw new Error('a stage takes units in one or two states');
	const rows = states.flatMap((state) => q.inWork(db).all({ stationId, state }));
	if (states.length > 1) rows.sort((a, b) => b.updatedAt.getTime() - a.updatedAt.getTime());
	const items = rows.slice(0, limit).map(({ updatedAt: _u, ...r }) => ({ ...r, stateSince: r.stateSince.toISOString() }));
	const total = rows.length < 100 ? rows.length : (q.inWorkCount(db).get({ stationId, s1: states[0], s2: states[1] ?? states[0] })?.n ?? rows.length);
	return { items, total };
}

export function stationBoard(db: DbOrTx, code: string, now: Date = new Date()): Board | null {
	const row = q.station(db).get({ code });
	if (!row) return null;
	const view = toStationView(row);
	const inWork = inWorkAt(db, row.id, STAGE_INFO[view.stage].input);
	const busy = new Set(inWork.items.map((u) => u.serial));
	const queue = stationQueue(db, view.stage);
	const waitingItems = queue.items.filter((q) => !busy.has(q.serial));
	const since = startOfDay(now);
	const doneRows = q.done(db).all({ stationId: row.id, since: since.getTime() });
	const doneTotal = q.doneCount(db).get({ stationId: row.id, since: since.getTime() })?.n ?? 0;
	return {
		station: view,
		waiting: { items: waitingItems.map((q) => toBoardUnit(q, view.overdueHours, now)), total: Math.max(0, queue.total - inWork.total) },
		inWork: { items: inWork.items.map((q) => toBoardUnit(q, view.overdueHours, now)), total: inWork.total },
		done: {
			items: doneRows.map((d) => ({
				serial: d.serial,
				action: d.action,
				done: d.action === 'undo' ? 'Undone' : isActionName(d.action) ? ACTION_INFO[d.action].done : d.action,
				toState: d.toState,
				at: d.at.toISOString(),
				by: d.by,
				seq: d.seq
			})),
			total: doneTotal
		},
		at: now.toISOString()
	};
}
