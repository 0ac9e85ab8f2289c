/**
 * Units and their history: receiving units into a lot, making a move (one synchronous
 * transaction: idempotency, version, guard, append, update), reading a unit and lists.
 */
import { and, asc, desc, eq, or, sql, type SQL } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import type { Role } from '../domain/auth/roles';
import { ACTION_INFO, isActionName, type ActionName } from '../domain/units/actions';
import { decide, mainAction, stageAction } from '../domain/units/machine';
import { eventDataView, type EventDataView } from '../domain/units/event-data';
import { clip } from '../domain/input/json';
import { formatSerial, normalizeSerial } from '../domain/units/serial';
import { STAGE_INFO, nextStage, type Stage, type UnitState } from '../domain/units/states';
import type { Db, DbOrTx, Tx } from './db';
import { coreLot, counter, station, supplier, turboModel, unit, unitEvent, user, type Unit } from './db/schema';
import { prepared } from './db/prepared';
import { publish } from './live';
import { loadFacts } from './unit-facts';
import { afterUnitMove } from './rebuild-notify';
import { moveStall } from './move-stall';

/** Moves take notes of up to 1000 characters; a longer stored note is shown cut. */
const MAX_NOTE_SHOWN = 2000;

export interface Actor {
	id: string;
	role: Role;
}

export interface UnitView {
	serial: string;
	originalTag: string;
	state: UnitState;
	held: boolean;
	holdReason: string | null;
	version: number;
	priority: number;
	stateSince: string;
	nextStage: Stage | null;
	lot: { code: string; source: string; supplier: string | null };
	model: { code: string; family: string };
}

export interface EventView {
	seq: number;
	action: string;
	fromState: UnitState | null;
	toState: UnitState;
	at: string;
	station: { code: string; name: string } | null;
	user: { name: string } | null;
	note: string | null;
	/** The known fields of the move's data, safe to show whatever is stored (see `eventDataView`). */
	data: EventDataView | null;
}

export type MoveResult =
	| { ok: true; status: 200 | 201; replayed: boolean; unit: UnitView; event: EventView }
	| {
			ok: false;
			status: 400 | 403 | 404 | 409 | 422;
			code: 'invalid' | 'forbidden' | 'not_found' | 'refused' | 'version_conflict' | 'key_reused';
			message: string;
			fields?: Record<string, string[]>;
			unit?: UnitView;
	  };

export interface MoveInput {
	serial: string;
	action: ActionName;
	stationCode?: string | null;
	idempotencyKey: string;
	expectedVersion?: number;
	note?: string | null;
	data?: Record<string, unknown>;
}

function unitViewQuery(db: DbOrTx) {
	return db
		.select({
			unit,
			lotCode: coreLot.code,
			lotSource: coreLot.source,
			supplierName: supplier.name,
			modelCode: turboModel.code,
			modelFamily: turboModel.family
		})
		.from(unit)
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId));
}

type UnitViewRow = {
	unit: Unit;
	lotCode: string;
	lotSource: string;
	supplierName: string | null;
	modelCode: string;
	modelFamily: string;
};

function toUnitView(r: UnitViewRow): UnitView {
	return {
		serial: r.unit.serial,
		originalTag: r.unit.originalTag,
		state: r.unit.state,
		held: r.unit.held,
		holdReason: r.unit.holdReason,
		version: r.unit.version,
		priority: r.unit.priority,
		stateSince: r.unit.stateSince.toISOString(),
		nextStage: nextStage(r.unit.state),
		lot: { code: r.lotCode, source: r.lotSource, supplier: r.supplierName },
		model: { code: r.modelCode, family: r.modelFamily }
	};
}

const ph = sql.placeholder;

/** The hot path's statements, prepared once per connection (see db/prepared.ts). */
const q = {
	viewBySerial: (d: DbOrTx) => prepared(d, 'units.viewBySerial', (d) => unitViewQuery(d).where(eq(unit.serial, ph('serial'))).prepare()),
	rowBySerial: (d: DbOrTx) => prepared(d, 'units.rowBySerial', (d) => d.select().from(unit).where(eq(unit.serial, ph('serial'))).prepare()),
	stationByCode: (d: DbOrTx) => prepared(d, 'units.stationByCode', (d) => d.select().from(station).where(eq(station.code, ph('code'))).prepare()),
	eventById: (d: DbOrTx) => prepared(d, 'units.eventById', (d) => eventViewQuery(d).where(eq(unitEvent.id, ph('id'))).prepare()),
	history: (d: DbOrTx) => prepared(d, 'units.history', (d) => eventViewQuery(d).where(eq(unitEvent.unitId, ph('unitId'))).orderBy(asc(unitEvent.seq)).prepare()),
	priorByKey: (d: DbOrTx) =>
		prepared(d, 'units.priorByKey', (d) =>
			d
				.select({ event: unitEvent, serial: unit.serial })
				.from(unitEvent)
				.innerJoin(unit, eq(unit.id, unitEvent.unitId))
				.where(eq(unitEvent.idempotencyKey, ph('key')))
				.prepare()
		),
	insertEvent: (d: DbOrTx) =>
		prepared(d, 'units.insertEvent', (d) =>
			d
				.insert(unitEvent)
				.values({
					unitId: ph('unitId'),
					seq: ph('seq'),
					fromState: ph('fromState'),
					toState: ph('toState'),
					action: ph('action'),
					stationId: ph('stationId'),
					userId: ph('userId'),
					at: ph('at'),
					idempotencyKey: ph('idempotencyKey'),
					note: ph('note'),
					data: ph('data')
				})
				.returning({ id: unitEvent.id })
				.prepare()
		),
	updateState: (d: DbOrTx) =>
		prepared(d, 'units.updateState', (d) =>
			d
				.update(unit)
				.set({
					state: sql`${ph('state')}`,
					held: sql`${ph('held')}`,
					holdReason: sql`${ph('holdReason')}`,
					version: sql`${ph('version')}`,
					stateSince: sql`${ph('stateSince')}`,
					updatedAt: sql`${ph('updatedAt')}`
				})
				.where(and(eq(unit.id, ph('id')), eq(unit.version, ph('expectedVersion'))))
				.prepare()
		)
};

export function findUnitView(db: DbOrTx, serial: string): UnitView | null {
	const row = q.viewBySerial(db).get({ serial });
	return row ? toUnitView(row) : null;
}

function eventViewQuery(db: DbOrTx) {
	return db
		.select({
			event: unitEvent,
			stationCode: station.code,
			stationName: station.name,
			userName: user.name
		})
		.from(unitEvent)
		.leftJoin(station, eq(station.id, unitEvent.stationId))
		.leftJoin(user, eq(user.id, unitEvent.userId));
}

function toEventView(r: {
	event: typeof unitEvent.$inferSelect;
	stationCode: string | null;
	stationName: string | null;
	userName: string | null;
}): EventView {
	return {
		seq: r.event.seq,
		action: r.event.action,
		fromState: r.event.fromState,
		toState: r.event.toState,
		at: r.event.at.toISOString(),
		station: r.stationCode ? { code: r.stationCode, name: r.stationName ?? r.stationCode } : null,
		user: r.userName ? { name: r.userName } : null,
		note: r.event.note === null ? null : clip(r.event.note, MAX_NOTE_SHOWN),
		data: eventDataView(r.event.data)
	};
}

export function unitHistory(db: DbOrTx, unitId: number): EventView[] {
	return q.history(db).all({ unitId }).map(toEventView);
}

export function getUnitWithHistory(db: DbOrTx, serial: string): { unit: UnitView; history: EventView[] } | null {
	const row = q.viewBySerial(db).get({ serial });
	if (!row) return null;
	return { unit: toUnitView(row), history: unitHistory(db, row.unit.id) };
}

/** Make a move on a unit. Everything happens in one immediate transaction. */
/**
 * Work done inside the move's transaction, before the state machine decides: records the
 * move's guards look for (an inspection with its answers and photos). A refused move rolls
 * the hook's writes back with it.
 */
export interface MoveHooks {
	before?: (tx: Tx, unitRow: Unit, nextSeq: number, stationRow: typeof station.$inferSelect | undefined) => void;
	/** Decide the move and roll everything back: what the move would answer, nothing written, nothing published. */
	dryRun?: boolean;
}

class RolledBack extends Error {
	constructor(readonly result: MoveResult) {
		super('move refused; rolled back');
	}
}

export function applyMove(db: Db, actor: Actor, input: MoveInput, now: Date = new Date(), hooks: MoveHooks = {}): MoveResult {
	const result = applyMoveInTransaction(db, actor, input, now, hooks);
	if (result.ok && !result.replayed && !hooks.dryRun) {
		publish({
			topic: 'unit',
			kind: result.event.action,
			serial: result.unit.serial,
			state: result.unit.state,
			held: result.unit.held,
			version: result.unit.version,
			stationCode: result.event.station?.code ?? null,
			at: result.event.at
		});
	}
	return result;
}

function applyMoveInTransaction(db: Db, actor: Actor, input: MoveInput, now: Date, hooks: MoveHooks): MoveResult {
	if (!isActionName(input.action) || input.action === 'receive') {
		return { ok: false, status: 400, code: 'invalid', message: 'Unknown action.', fields: { action: ['Unknown action.'] } };
	}
	try {
		return db.transaction(
			(tx): MoveResult => {
				const r = moveBody(tx);
				if ((!r.ok && hooks.before) || hooks.dryRun) throw new RolledBack(r);
				return r;
			},
			{ behavior: 'immediate' }
		);
	} catch (e) {
		if (e instanceof RolledBack) return e.result;
		throw e;
	}
	function moveBody(tx: Tx): MoveResult {
		{
			const prior = q.priorByKey(tx).get({ key: input.idempotencyKey });
			if (prior) {
				if (prior.serial !== input.serial || prior.event.action !== input.action) {
					return {
						ok: false,
						status: 422,
						code: 'key_reused',
						message: 'This request key was already used for a different move; send a new key.'
					};
				}
				const view = findUnitView(tx, input.serial)!;
				const ev = q.eventById(tx).get({ id: prior.event.id })!;
				return { ok: true, status: 200, replayed: true, unit: view, event: toEventView(ev) };
			}

			const row = q.rowBySerial(tx).get({ serial: input.serial });
			if (!row) return { ok: false, status: 404, code: 'not_found', message: `No unit ${input.serial} in the shop.` };
			moveStall?.();

			let stationRow: typeof station.$inferSelect | undefined;
			if (input.stationCode) {
				stationRow = q.stationByCode(tx).get({ code: input.stationCode });
				if (!stationRow || !stationRow.active) {
					return {
						ok: false,
						status: 400,
						code: 'invalid',
						message: `No station ${input.stationCode}.`,
						fields: { stationCode: ['Unknown station.'] }
					};
				}
			}

			const current = () => findUnitView(tx, input.serial)!;
			if (input.expectedVersion !== undefined && input.expectedVersion !== row.version) {
				return {
					ok: false,
					status: 409,
					code: 'version_conflict',
					message: `${row.serial} changed since you looked at it (it is now ${row.state}${row.held ? ', on hold' : ''}); check it and try again.`,
					unit: current()
				};
			}
			hooks.before?.(tx, row, row.version + 1, stationRow);

			const decision = decide(
				{ serial: row.serial, state: row.state, held: row.held, holdReason: row.holdReason },
				{ action: input.action, role: actor.role, stationStage: stationRow?.stage ?? null, data: input.data ?? {} },
				loadFacts(tx, row, input.action)
			);
			if (!decision.ok) {
				if (decision.kind === 'forbidden') return { ok: false, status: 403, code: 'forbidden', message: decision.message };
				if (decision.kind === 'invalid') {
					return { ok: false, status: 400, code: 'invalid', message: decision.message, fields: decision.fields };
				}
				return { ok: false, status: 409, code: 'refused', message: decision.message, unit: current() };
			}

			const seq = row.version + 1;
			const inserted = q.insertEvent(tx).get({
				unitId: row.id,
				seq,
				fromState: decision.from,
				toState: decision.to,
				action: input.action,
				stationId: stationRow?.id ?? null,
				userId: actor.id,
				at: now,
				idempotencyKey: input.idempotencyKey,
				note: input.note?.trim() || null,
				data: Object.keys(decision.data).length ? decision.data : null
			})!;
			const updated = q.updateState(tx).run({
				state: decision.to,
				held: decision.held ? 1 : 0,
				holdReason: decision.holdReason,
				version: seq,
				stateSince: (decision.to !== row.state ? now : row.stateSince).getTime(),
				updatedAt: now.getTime(),
				id: row.id,
				expectedVersion: row.version
			});
			if (updated.changes !== 1) throw new Error(`lost update on ${row.serial}`);
			afterUnitMove(tx, row, input.action, decision.to, now);
			const ev = q.eventById(tx).get({ id: inserted.id })!;
			return { ok: true, status: 201, replayed: false, unit: current(), event: toEventView(ev) };
		}
	}
}

/** Hand out `count` consecutive serial numbers inside the caller's transaction. */
export function allocateSerials(tx: DbOrTx, count: number): string[] {
	const row = tx.select().from(counter).where(eq(counter.name, 'unit_serial')).get();
	const first = (row?.value ?? 0) + 1;
	const last = first + count - 1;
	if (row) tx.update(counter).set({ value: last }).where(eq(counter.name, 'unit_serial')).run();
	else tx.insert(counter).values({ name: 'unit_serial', value: last }).run();
	return Array.from({ length: count }, (_, i) => formatSerial(first + i));
}

export interface NewUnit {
	modelId: number;
	originalTag?: string;
	notes?: string;
}

/** Receive units into a lot: each gets a serial and its first history entry. */
export function receiveUnits(
	db: Db,
	actor: Actor,
	lotId: number,
	units: readonly NewUnit[],
	now: Date = new Date()
): string[] {
	if (!ACTION_INFO.receive.roles.includes(actor.role)) throw new Error(`a ${actor.role} cannot receive units`);
	const created = db.transaction(
		(tx) => {
			const serials = allocateSerials(tx, units.length);
			units.forEach((u, i) => {
				const created = tx
					.insert(unit)
					.values({
						serial: serials[i],
						originalTag: u.originalTag?.trim() ?? '',
						notes: u.notes?.trim() ?? '',
						lotId,
						modelId: u.modelId,
						state: 'received',
						version: 1,
						stateSince: now,
						updatedAt: now,
						createdAt: now
					})
					.returning({ id: unit.id })
					.get();
				tx.insert(unitEvent)
					.values({
						unitId: created.id,
						seq: 1,
						fromState: null,
						toState: 'received',
						action: 'receive',
						userId: actor.id,
						at: now,
						idempotencyKey: `receive:${serials[i]}:${randomUUID()}`
					})
					.run();
			});
			return serials;
		},
		{ behavior: 'immediate' }
	);
	for (const serial of created) publish({ topic: 'unit', kind: 'receive', serial, state: 'received', stationCode: null, at: now.toISOString() });
	return created;
}

export interface UnitFilter {
	state?: UnitState;
	stage?: Stage;
	lot?: string;
	model?: string;
	q?: string;
	held?: boolean;
	page?: number;
	pageSize?: number;
}

export interface UnitPage {
	items: UnitView[];
	total: number;
	page: number;
	pageSize: number;
}

export function listUnits(db: DbOrTx, filter: UnitFilter): UnitPage {
	const pageSize = Math.min(Math.max(filter.pageSize ?? 50, 1), 200);
	const page = Math.max(filter.page ?? 1, 1);
	const where: SQL[] = [];
	if (filter.state) where.push(eq(unit.state, filter.state));
	if (filter.stage) {
		const states = STAGE_INFO[filter.stage].input;
		where.push(or(...states.map((s) => eq(unit.state, s)))!);
	}
	if (filter.lot) where.push(eq(coreLot.code, filter.lot));
	if (filter.model) where.push(eq(turboModel.code, filter.model));
	if (filter.held !== undefined) where.push(eq(unit.held, filter.held));
	if (filter.q) {
		const q = filter.q.trim();
		const pattern = `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
		where.push(
			or(
				eq(unit.serial, q.toUpperCase()),
				sql`${unit.serial} like ${pattern} escape '\\'`,
				sql`${unit.originalTag} like ${pattern} escape '\\'`
			)!
		);
	}
	const cond = where.length ? and(...where) : undefined;
	const total =
		db
			.select({ n: sql<number>`count(*)` })
			.from(unit)
			.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
			.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
			.where(cond)
			.get()?.n ?? 0;
	const rows = unitViewQuery(db)
		.where(cond)
		.orderBy(desc(unit.updatedAt), desc(unit.id))
		.limit(pageSize)
		.offset((page - 1) * pageSize)
		.all();
	return { items: rows.map(toUnitView), total, page, pageSize };
}


/**
 * One scan at a station: the station's main move for whatever state the unit is in.
 * A teardown scan of an inspected unit asks for the verdict instead of guessing it.
 */
export function scanAtStation(
	db: Db,
	actor: Actor,
	stationCode: string,
	serialInput: string,
	idempotencyKey: string,
	now: Date = new Date()
): MoveResult {
	const serial = normalizeSerial(serialInput);
	if (!serial) {
		return {
			ok: false,
			status: 400,
			code: 'invalid',
			message: `"${serialInput.slice(0, 40)}" is not a shop serial (SY- and five digits).`,
			fields: { serial: ['Not a shop serial.'] }
		};
	}
	const stationRow = q.stationByCode(db).get({ code: stationCode });
	if (!stationRow) return { ok: false, status: 404, code: 'not_found', message: `No station ${stationCode}.` };
	const row = q.rowBySerial(db).get({ serial });
	if (!row) return { ok: false, status: 404, code: 'not_found', message: `No unit ${serial} in the shop.` };
	const action = mainAction(stationRow.stage, row.state) ?? stageAction(stationRow.stage);
	if (stationRow.stage === 'teardown' && row.state === 'inspected' && !row.held) {
		return {
			ok: false,
			status: 409,
			code: 'refused',
			message: `${serial} is torn down; record the verdict: accept or scrap.`,
			unit: findUnitView(db, serial)!
		};
	}
	return applyMove(db, actor, { serial, action, stationCode, idempotencyKey }, now);
}
