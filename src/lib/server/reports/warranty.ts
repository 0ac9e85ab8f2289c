/**
 * Warranty returns: a unit received in a warranty-return lot points at the unit it is a return
 * of (`unit.return_of_unit_id`). Its teardown verdict (accept or scrap) carries the failure mode
 * found (`data.failureMode`). Failure modes are counted by model and by the build week of the
 * original unit (the week of its last assembly event). Trace-back gathers what the shop knows
 * of the original unit: lot and supplier, teardown inspection, history with the techs at each
 * station.
 */
import { aliasedTable, and, desc, eq, gte, inArray, isNotNull, lte, sql, type SQL } from 'drizzle-orm';
import { FAILURE_MODE_LABEL, isFailureMode, type FailureMode } from '../../domain/warranty/failure-modes';
import { judgeLots, PART_KINDS, type LotCounts, type LotVerdict, type PartKind } from '../../domain/warranty/parts-lots';
import type { Stage, UnitState } from '../../domain/units/states';
import { buildRecord, type BuildRecordView } from '../balance';
import type { DbOrTx } from '../db';
import { jsonText, weekOfMs } from '../db/report-sql';
import { assemblyRecord, coreLot, supplier, turboModel, unit, unitEvent } from '../db/schema';
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

export interface PartsLotReport {
	/** Shipped units with an assembly record in view, how many came back, the rate and its 95 % interval. */
	shop: { shipped: number; returned: number; rate: number | null; low: number | null; high: number | null };
	lots: LotVerdict[];
}

/** Each unit's latest assembly record (the build it shipped as). */
function latestAssembly(db: DbOrTx) {
	return db
		.select({ unitId: assemblyRecord.unitId, recordId: sql<number>`max(${assemblyRecord.id})`.as('record_id') })
		.from(assemblyRecord)
		.groupBy(assemblyRecord.unitId)
		.as('latest_assembly');
}

/** Units that came back under warranty at least once: the original's id and how many returns. */
function cameBack(db: DbOrTx) {
	return db
		.select({ originalId: sql<number>`${unit.returnOfUnitId}`.as('original_id'), returns: sql<number>`count(*)`.as('returns') })
		.from(unit)
		.where(isNotNull(unit.returnOfUnitId))
		.groupBy(unit.returnOfUnitId)
		.as('came_back');
}

const LOT_COLUMN: Record<PartKind, typeof assemblyRecord.bearingKitLot | typeof assemblyRecord.sealKitLot> = {
	bearing_kit: assemblyRecord.bearingKitLot,
	seal_kit: assemblyRecord.sealKitLot
};

/**
 * Warranty returns by the bearing-kit and seal-kit lots a unit was built from (its latest
 * assembly record), with the failure modes of the returns. The dates filter the build (the
 * assembly record's day), so a lot's shipped units and their returns are the same cohort; the
 * model filters the unit. Counted in SQL; the rule that flags a lot is `domain/warranty/parts-lots.ts`.
 */
export function partsLotReport(db: DbOrTx, filter: Pick<ReportFilter, 'from' | 'to' | 'model'> = {}): PartsLotReport {
	const built = aliasedTable(unit, 'built');
	const returned = aliasedTable(unit, 'returned_unit');
	const verdictEvent = aliasedTable(unitEvent, 'verdict_event');
	const last = latestAssembly(db);
	const back = cameBack(db);
	const where: SQL[] = [];
	const builtDay = sql<string>`date(${assemblyRecord.at} / 1000, 'unixepoch')`;
	if (filter.from) where.push(gte(builtDay, filter.from));
	if (filter.to) where.push(lte(builtDay, filter.to));
	if (filter.model) where.push(eq(turboModel.code, filter.model));
	const isShipped = sql`${built.state} = 'shipped'`;
	const shippedCount = sql<number>`coalesce(sum(case when ${isShipped} then 1 else 0 end), 0)`.mapWith(Number);
	const returnedCount = sql<number>`coalesce(sum(case when ${isShipped} and ${back.originalId} is not null then 1 else 0 end), 0)`.mapWith(Number);

	const shop = db
		.select({ shipped: shippedCount, returned: returnedCount })
		.from(last)
		.innerJoin(assemblyRecord, eq(assemblyRecord.id, last.recordId))
		.innerJoin(built, eq(built.id, last.unitId))
		.innerJoin(turboModel, eq(turboModel.id, built.modelId))
		.leftJoin(back, eq(back.originalId, built.id))
		.where(and(...where))
		.get() ?? { shipped: 0, returned: 0 };

	const v = verdicts(db);
	const mode = jsonText(verdictEvent.data, 'failureMode');
	const lots: LotCounts[] = [];
	for (const kind of PART_KINDS) {
		const lotCol = LOT_COLUMN[kind];
		const counts = db
			.select({ lot: lotCol, built: sql<number>`count(*)`.mapWith(Number), shipped: shippedCount, returned: returnedCount })
			.from(last)
			.innerJoin(assemblyRecord, eq(assemblyRecord.id, last.recordId))
			.innerJoin(built, eq(built.id, last.unitId))
			.innerJoin(turboModel, eq(turboModel.id, built.modelId))
			.leftJoin(back, eq(back.originalId, built.id))
			.where(and(...where))
			.groupBy(lotCol)
			.all();
		// One row per return of a shipped unit built from the lot, by the mode its teardown found.
		const mix = db
			.select({ lot: lotCol, mode, count: sql<number>`count(*)`.mapWith(Number) })
			.from(last)
			.innerJoin(assemblyRecord, eq(assemblyRecord.id, last.recordId))
			.innerJoin(built, eq(built.id, last.unitId))
			.innerJoin(turboModel, eq(turboModel.id, built.modelId))
			.innerJoin(returned, eq(returned.returnOfUnitId, built.id))
			.leftJoin(v, eq(v.unitId, returned.id))
			.leftJoin(verdictEvent, eq(verdictEvent.id, v.eventId))
			.where(and(isShipped, ...where))
			.groupBy(lotCol, mode)
			.all();
		const modesOf = new Map<string, Map<FailureMode | 'not_recorded', number>>();
		for (const m of mix) {
			const key: FailureMode | 'not_recorded' = isFailureMode(m.mode) ? m.mode : 'not_recorded';
			const byMode = modesOf.get(m.lot) ?? new Map();
			byMode.set(key, (byMode.get(key) ?? 0) + m.count);
			modesOf.set(m.lot, byMode);
		}
		for (const c of counts) {
			const modes = [...(modesOf.get(c.lot)?.entries() ?? [])].map(([m, count]) => ({ mode: m, count })).sort((a, b) => b.count - a.count || a.mode.localeCompare(b.mode));
			lots.push({ kind, lot: c.lot, built: c.built, shipped: c.shipped, returned: c.returned, modes });
		}
	}
	return judgeLots(lots, shop);
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
		/** Its assembly records (clearances, parts lots, wheels) and balance runs, oldest first. */
		build: BuildRecordView;
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
				.map((e) => ({ stage: STAGE_OF_ACTION[e.action] ?? null, action: e.action, station: e.station?.name ?? null, tech: e.user?.name ?? null, at: e.at })),
			build: buildRecord(db, ret.returnOf)
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
