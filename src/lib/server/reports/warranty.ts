/**
 * Warranty returns: a unit received in a warranty-return lot points at the unit it is a return
 * of (`unit.return_of_unit_id`). Its teardown verdict (accept or scrap) carries the failure mode
 * found (`data.failureMode`). Failure modes are counted by model and by the build week of the
 * original unit (the week of its last assembly event). Trace-back gathers what the shop knows
 * of the original unit: lot and supplier, teardown inspection, history with the techs at each
 * station.
 */
import { aliasedTable, and, desc, eq, gte, inArray, isNotNull, lte, sql } from 'drizzle-orm';
import { FAILURE_MODE_LABEL, isFailureMode, type FailureMode } from '../../domain/warranty/failure-modes';
import type { Stage, UnitState } from '../../domain/units/states';
import type { DbOrTx } from '../db';
import { jsonText, weekOfMs } from '../db/report-sql';
import { coreLot, supplier, turboModel, unit, unitEvent } from '../db/schema';
import { getUnitWithHistory, type EventView, type UnitView } from '../units';
import type { ReportFilter } from './filter';

const original = aliasedTable(unit, 'original');

export interface ReturnRow {
	serial: string;
	state: UnitState;
	receivedAt: string;
	originalSerial: string;
	model: string;
	originalLot: string;
	supplier: string | null;
	buildWeek: string | null;
	failureMode: FailureMode | null;
}

export interface WarrantyReport {
	returns: ReturnRow[];
	byModel: { model: string; mode: FailureMode | 'not_recorded'; count: number }[];
	byBuildWeek: { week: string; mode: FailureMode | 'not_recorded'; count: number }[];
}

/** Each return's last verdict event (accept or scrap), with its failure mode. */
function verdicts(db: DbOrTx) {
	return db
		.select({ unitId: unitEvent.unitId, eventId: sql<number>`max(${unitEvent.id})`.as('verdict_id') })
		.from(unitEvent)
		.where(inArray(unitEvent.action, ['accept', 'scrap']))
		.groupBy(unitEvent.unitId)
		.as('verdict');
}

/** Build week of each unit: the week of its last assembly event. */
function builds(db: DbOrTx) {
	return db
		.select({ unitId: unitEvent.unitId, at: sql<number>`max(${unitEvent.at})`.as('built_at') })
		.from(unitEvent)
		.where(eq(unitEvent.action, 'assemble'))
		.groupBy(unitEvent.unitId)
		.as('build');
}

export function warrantyReport(db: DbOrTx, filter: Pick<ReportFilter, 'from' | 'to' | 'model'> = {}): WarrantyReport {
	const v = verdicts(db);
	const b = builds(db);
	const verdictEvent = aliasedTable(unitEvent, 'verdict_event');
	const mode = jsonText(verdictEvent.data, 'failureMode');
	const where = [isNotNull(unit.returnOfUnitId)];
	const receivedDay = sql<string>`date(${unit.createdAt} / 1000, 'unixepoch')`;
	if (filter.from) where.push(gte(receivedDay, filter.from));
	if (filter.to) where.push(lte(receivedDay, filter.to));
	if (filter.model) where.push(eq(turboModel.code, filter.model));
	const rows = db
		.select({
			serial: unit.serial,
			state: unit.state,
			createdAt: unit.createdAt,
			originalSerial: original.serial,
			model: turboModel.code,
			originalLot: coreLot.code,
			supplier: supplier.name,
			buildWeek: sql<string | null>`case when ${b.at} is null then null else ${weekOfMs(b.at)} end`,
			failureMode: mode
		})
		.from(unit)
		.innerJoin(original, eq(original.id, unit.returnOfUnitId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.innerJoin(coreLot, eq(coreLot.id, original.lotId))
		.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
		.leftJoin(v, eq(v.unitId, unit.id))
		.leftJoin(verdictEvent, eq(verdictEvent.id, v.eventId))
		.leftJoin(b, eq(b.unitId, original.id))
		.where(and(...where))
		.orderBy(desc(unit.createdAt), desc(unit.id))
		.all();
	const returns: ReturnRow[] = rows.map((r) => ({
		serial: r.serial,
		state: r.state,
		receivedAt: r.createdAt.toISOString(),
		originalSerial: r.originalSerial,
		model: r.model,
		originalLot: r.originalLot,
		supplier: r.supplier,
		buildWeek: r.buildWeek,
		failureMode: isFailureMode(r.failureMode) ? r.failureMode : null
	}));
	// The cross-tabs are counted from the rows above (one per return, already filtered in SQL).
	const tab = <K extends string>(key: (r: ReturnRow) => string | null) => {
		const m = new Map<string, number>();
		for (const r of returns) {
			const k = `${key(r) ?? '—'}\u0000${r.failureMode ?? 'not_recorded'}`;
			m.set(k, (m.get(k) ?? 0) + 1);
		}
		return [...m.entries()]
			.map(([k, count]) => {
				const [g, md] = k.split('\u0000');
				return { g: g as K, mode: md as FailureMode | 'not_recorded', count };
			})
			.sort((a, b) => a.g.localeCompare(b.g) || a.mode.localeCompare(b.mode));
	};
	return {
		returns,
		byModel: tab((r) => r.model).map(({ g, ...x }) => ({ model: g, ...x })),
		byBuildWeek: tab((r) => r.buildWeek).map(({ g, ...x }) => ({ week: g, ...x }))
	};
}

export interface StationWork {
	stage: Stage | null;
	action: string;
	station: string | null;
	tech: string | null;
	at: string;
}

export interface TraceBack {
	unit: UnitView;
	history: EventView[];
	failureMode: FailureMode | null;
	failureModeLabel: string | null;
	original: {
		unit: UnitView;
		history: EventView[];
		lot: { code: string; receivedOn: string; source: string; supplier: string | null; costPerCoreCents: number };
		/** The teardown of the original core: its inspect, accept or scrap events with their data. */
		inspection: EventView[];
		/** Who did what where, in order. */
		work: StationWork[];
	} | null;
}

const STAGE_OF_ACTION: Record<string, Stage> = {
	inspect: 'teardown',
	accept: 'teardown',
	clean: 'clean',
	machine: 'machine',
	paint: 'paint',
	assemble: 'assemble',
	balance: 'balance',
	pack: 'pack',
	ship: 'ship'
};

export function traceBack(db: DbOrTx, serial: string): TraceBack | null {
	const ret = db.select({ id: unit.id, returnOf: unit.returnOfUnitId }).from(unit).where(eq(unit.serial, serial)).get();
	if (!ret) return null;
	const mine = getUnitWithHistory(db, serial)!;
	const verdict = [...mine.history].reverse().find((e) => e.action === 'accept' || e.action === 'scrap');
	const fm = verdict?.data?.failureMode;
	const failureMode = isFailureMode(fm) ? fm : null;
	let orig: TraceBack['original'] = null;
	if (ret.returnOf) {
		const o = db
			.select({ serial: unit.serial, code: coreLot.code, receivedOn: coreLot.receivedOn, source: coreLot.source, supplier: supplier.name, cost: coreLot.costPerCoreCents })
			.from(unit)
			.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
			.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
			.where(eq(unit.id, ret.returnOf))
			.get()!;
		const found = getUnitWithHistory(db, o.serial)!;
		orig = {
			unit: found.unit,
			history: found.history,
			lot: { code: o.code, receivedOn: o.receivedOn, source: o.source, supplier: o.supplier, costPerCoreCents: o.cost },
			inspection: found.history.filter((e) => e.action === 'inspect' || e.action === 'accept' || e.action === 'scrap'),
			work: found.history
				.filter((e) => STAGE_OF_ACTION[e.action])
				.map((e) => ({ stage: STAGE_OF_ACTION[e.action] ?? null, action: e.action, station: e.station?.name ?? null, tech: e.user?.name ?? null, at: e.at }))
		};
	}
	return { unit: mine.unit, history: mine.history, failureMode, failureModeLabel: failureMode ? FAILURE_MODE_LABEL[failureMode] : null, original: orig };
}

export type LinkResult = { ok: true } | { ok: false; field: 'returnSerial' | 'originalSerial'; message: string };

/** Link a unit received in a warranty-return lot to the shipped unit it is a return of. */
export function linkWarrantyReturn(db: DbOrTx, returnSerial: string, originalSerial: string): LinkResult {
	const r = db
		.select({ id: unit.id, source: coreLot.source, returnOf: unit.returnOfUnitId })
		.from(unit)
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.where(eq(unit.serial, returnSerial))
		.get();
	if (!r) return { ok: false, field: 'returnSerial', message: `No unit ${returnSerial} in the shop.` };
	if (r.source !== 'warranty_return') return { ok: false, field: 'returnSerial', message: `${returnSerial} was not received as a warranty return.` };
	if (r.returnOf) return { ok: false, field: 'returnSerial', message: `${returnSerial} is already linked to its original serial.` };
	const o = db.select({ id: unit.id, state: unit.state }).from(unit).where(eq(unit.serial, originalSerial)).get();
	if (!o) return { ok: false, field: 'originalSerial', message: `No unit ${originalSerial} in the shop.` };
	if (o.id === r.id) return { ok: false, field: 'originalSerial', message: 'A unit cannot be a return of itself.' };
	if (o.state !== 'shipped') return { ok: false, field: 'originalSerial', message: `${originalSerial} has not shipped, so it cannot have come back.` };
	db.update(unit).set({ returnOfUnitId: o.id }).where(and(eq(unit.id, r.id), sql`${unit.returnOfUnitId} is null`)).run();
	return { ok: true };
}

export { FAILURE_MODE_LABEL };
