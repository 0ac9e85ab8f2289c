/**
 * Core lots: the list with counts per lot, creating a lot, a lot with its units, adding units
 * one by one and importing a manifest. Units are always made by `receiveUnits` (serials and
 * the first history entry), inside one immediate transaction with the checks.
 */
import { and, asc, eq, sql } from 'drizzle-orm';
import { readCsvTable, parseCsvTable, type CsvTable } from '../domain/import/csv-table';
import { toCsv } from '../csv/write';
import type { Role } from '../domain/auth/roles';
import { maySee } from './access';
import { applyColumnMap, checkColumnMap, guessColumnMap, type ColumnMap } from '../domain/import/map-columns';
import { LOT_SOURCE_LABEL, lotFormSchema, nextLotCode, parseMoneyToCents, formatCents, type LotForm } from '../domain/lots/lot';
import {
	MANIFEST_FIELDS,
	checkManifest,
	tagKey,
	unitProblem,
	type KnownModel,
	type ManifestCheck,
	type ManifestKey,
	type UnitDraft
} from '../domain/lots/manifest';
import type { UnitState } from '../domain/units/states';
import type { Db, DbOrTx } from './db';
import { coreLot, supplier, turboModel, unit, type LotSource } from './db/schema';
import { receiveUnits, type Actor } from './units';

export interface LotSummary {
	code: string;
	source: LotSource;
	supplier: string | null;
	receivedOn: string;
	costPerCoreCents: number;
	expectedCount: number;
	received: number;
	/** Waiting for or in teardown (received, inspected). */
	waiting: number;
	/** Accepted and on its way (accepted ... packed). */
	inWork: number;
	shipped: number;
	scrapped: number;
	held: number;
	notes: string;
}

function lotSummaryQuery(db: DbOrTx) {
	const s = (cond: ReturnType<typeof sql>) => sql<number>`coalesce(sum(case when ${cond} then 1 else 0 end), 0)`;
	return db
		.select({
			lot: coreLot,
			supplierName: supplier.name,
			received: sql<number>`count(${unit.id})`,
			waiting: s(sql`${unit.state} in ('received', 'inspected')`),
			shipped: s(sql`${unit.state} = 'shipped'`),
			scrapped: s(sql`${unit.state} = 'scrapped'`),
			held: s(sql`${unit.held} = 1`)
		})
		.from(coreLot)
		.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
		.leftJoin(unit, eq(unit.lotId, coreLot.id))
		.groupBy(coreLot.id);
}

type SummaryRow = Awaited<ReturnType<ReturnType<typeof lotSummaryQuery>['all']>>[number];

function toSummary(r: SummaryRow): LotSummary {
	return {
		code: r.lot.code,
		source: r.lot.source,
		supplier: r.supplierName,
		receivedOn: r.lot.receivedOn,
		costPerCoreCents: r.lot.costPerCoreCents,
		expectedCount: r.lot.expectedCount,
		received: r.received,
		waiting: r.waiting,
		inWork: r.received - r.waiting - r.shipped - r.scrapped,
		shipped: r.shipped,
		scrapped: r.scrapped,
		held: r.held,
		notes: r.lot.notes
	};
}

export const LOT_SORT_KEYS = ['code', 'receivedOn', 'supplier', 'source', 'expectedCount', 'received', 'waiting', 'inWork', 'shipped', 'scrapped', 'held'] as const;
export type LotSortKey = (typeof LOT_SORT_KEYS)[number];
/** Sorting by these would show the order of a field the role may not see. */
const YIELD_KEYS: readonly LotSortKey[] = ['shipped', 'scrapped'];

/** A sort key the role may sort by (per-lot yields only for those who may see them). */
export function isLotSortKey(v: unknown, role?: Role): v is LotSortKey {
	if (typeof v !== 'string' || !(LOT_SORT_KEYS as readonly string[]).includes(v)) return false;
	return role === undefined || maySee(role, 'lotYield') || !YIELD_KEYS.includes(v as LotSortKey);
}

/** All lots with their counts; newest first unless a sort is given. */
export function listLots(db: DbOrTx, sort: LotSortKey = 'receivedOn', dir: 'asc' | 'desc' = 'desc'): LotSummary[] {
	const lots = lotSummaryQuery(db).all().map(toSummary);
	const sign = dir === 'asc' ? 1 : -1;
	return lots.sort((a, b) => {
		const x = a[sort] ?? '';
		const y = b[sort] ?? '';
		const c = typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y));
		return c !== 0 ? c * sign : a.code.localeCompare(b.code) * sign;
	});
}

/** A lot as one role may see it: the price per core and the per-lot yields only where FIELD_ACCESS allows. */
export type LotView = Omit<LotSummary, 'costPerCoreCents' | 'shipped' | 'scrapped'> & Partial<Pick<LotSummary, 'costPerCoreCents' | 'shipped' | 'scrapped'>>;

export function lotView(l: LotSummary, role: Role): LotView {
	const { costPerCoreCents, shipped, scrapped, ...rest } = l;
	return {
		...rest,
		...(maySee(role, 'lotCost') ? { costPerCoreCents } : {}),
		...(maySee(role, 'lotYield') ? { shipped, scrapped } : {})
	};
}

/** The lot list as CSV for one role: columns the role may not see are left out, not blanked. */
export function lotsCsv(lots: readonly LotSummary[], role: Role): string {
	const cost = maySee(role, 'lotCost');
	const yields = maySee(role, 'lotYield');
	const header = ['lot', 'received_on', 'source', 'supplier', ...(cost ? ['cost_per_core'] : []), 'expected', 'received', 'waiting_teardown', 'in_work', ...(yields ? ['shipped', 'scrapped'] : []), 'on_hold', 'notes'];
	return toCsv(
		header,
		lots.map((l) => [
			l.code,
			l.receivedOn,
			LOT_SOURCE_LABEL[l.source],
			l.supplier ?? '',
			...(cost ? [formatCents(l.costPerCoreCents).replace(/,/g, '')] : []),
			l.expectedCount,
			l.received,
			l.waiting,
			l.inWork,
			...(yields ? [l.shipped, l.scrapped] : []),
			l.held,
			l.notes
		])
	);
}

export function listModels(db: DbOrTx): KnownModel[] {
	return db.select({ id: turboModel.id, code: turboModel.code }).from(turboModel).where(eq(turboModel.active, true)).orderBy(asc(turboModel.code)).all();
}

export type CreateLotResult = { ok: true; code: string } | { ok: false; field: keyof LotForm; message: string };

export function createLot(db: Db, input: LotForm, today: string, now: Date = new Date()): CreateLotResult {
	const data = lotFormSchema(today).parse(input);
	return db.transaction(
		(tx): CreateLotResult => {
			let supplierId: number | null = null;
			if (data.supplierId) {
				const s = tx.select().from(supplier).where(eq(supplier.id, Number(data.supplierId))).get();
				if (!s || !s.active) return { ok: false, field: 'supplierId', message: 'That supplier is not on the list any more; choose another.' };
				supplierId = s.id;
			}
			const codes = tx.select({ code: coreLot.code }).from(coreLot).all().map((r) => r.code);
			const code = nextLotCode(data.receivedOn, codes);
			tx.insert(coreLot)
				.values({
					code,
					source: data.source,
					supplierId,
					receivedOn: data.receivedOn,
					costPerCoreCents: parseMoneyToCents(data.costPerCore)!,
					expectedCount: data.expectedCount,
					notes: data.notes,
					createdAt: now
				})
				.run();
			return { ok: true, code };
		},
		{ behavior: 'immediate' }
	);
}

export interface LotUnitRow {
	serial: string;
	originalTag: string;
	model: string;
	state: UnitState;
	held: boolean;
	notes: string;
	receivedAt: string;
}

export interface LotDetail {
	id: number;
	summary: LotSummary;
	createdAt: string;
	units: LotUnitRow[];
}

export function getLot(db: DbOrTx, code: string): LotDetail | null {
	const row = lotSummaryQuery(db).where(eq(coreLot.code, code)).get();
	if (!row) return null;
	const units = db
		.select({
			serial: unit.serial,
			originalTag: unit.originalTag,
			model: turboModel.code,
			state: unit.state,
			held: unit.held,
			notes: unit.notes,
			createdAt: unit.createdAt
		})
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(unit.lotId, row.lot.id))
		.orderBy(asc(unit.serial))
		.all()
		.map(({ createdAt, ...u }) => ({ ...u, receivedAt: createdAt.toISOString() }));
	return { id: row.lot.id, summary: toSummary(row), createdAt: row.lot.createdAt.toISOString(), units };
}

/** Tags already in the lot, by tagKey, with the serial that has each. */
export function tagsInLot(db: DbOrTx, lotId: number): Map<string, string> {
	const rows = db
		.select({ tag: unit.originalTag, serial: unit.serial })
		.from(unit)
		.where(and(eq(unit.lotId, lotId), sql`${unit.originalTag} <> ''`))
		.all();
	return new Map(rows.map((r) => [tagKey(r.tag), r.serial]));
}

export type AddUnitResult = { ok: true; serial: string } | { ok: false; field: keyof UnitDraft; message: string };

/** Receive one unit into a lot after the same checks a manifest row gets. */
export function addUnit(db: Db, actor: Actor, lotId: number, draft: UnitDraft, now: Date = new Date()): AddUnitResult {
	return db.transaction(
		(tx): AddUnitResult => {
			const problem = unitProblem(draft, { models: listModels(tx), tagsInLot: tagsInLot(tx, lotId) });
			if ('reason' in problem) return { ok: false, field: problem.field, message: problem.reason };
			const [serial] = receiveUnits(db, actor, lotId, [{ modelId: problem.model.id, originalTag: draft.originalTag, notes: draft.notes }], now);
			return { ok: true, serial };
		},
		{ behavior: 'immediate' }
	);
}

/** What the preview table shows: the file's columns, the map, and every row's verdict. */
export interface ManifestPreview {
	ok: true;
	headers: string[];
	/** The first rows as the file has them, for the map-columns table. */
	sample: string[][];
	map: ColumnMap<ManifestKey>;
	mapErrors: Partial<Record<ManifestKey, string>>;
	check: ManifestCheck | null;
	totalRows: number;
}

export type ManifestFileError = { ok: false; message: string };

function previewFromTable(
	db: DbOrTx,
	lotId: number,
	table: CsvTable,
	rawMap: Partial<Record<ManifestKey, unknown>> | null
): ManifestPreview {
	const map = rawMap ? checkColumnMap(MANIFEST_FIELDS, table.headers, rawMap) : { ok: true as const, map: guessColumnMap(MANIFEST_FIELDS, table.headers) };
	const mapErrors: Partial<Record<ManifestKey, string>> = map.ok ? {} : map.errors;
	if (map.ok && map.map.model === null) mapErrors.model = 'Choose the column that holds the model.';
	const check = Object.keys(mapErrors).length
		? null
		: checkManifest(applyColumnMap(table, map.map), { models: listModels(db), tagsInLot: tagsInLot(db, lotId) });
	return {
		ok: true,
		headers: table.headers,
		sample: table.rows.slice(0, 5).map((r) => r.cells),
		map: map.map,
		mapErrors,
		check,
		totalRows: table.rows.length
	};
}

/** First look at an uploaded file: read it, guess the columns, check every row. */
export function previewManifestFile(db: DbOrTx, lotId: number, bytes: Uint8Array): (ManifestPreview & { text: string }) | ManifestFileError {
	const table = readCsvTable(bytes);
	if (!table.ok) return table;
	const text = new TextDecoder().decode(bytes).replace(/^\uFEFF/, '');
	return { ...previewFromTable(db, lotId, table.value, null), text };
}

/** Again with the person's column choices (the file's text is carried by the form). */
export function previewManifestText(db: DbOrTx, lotId: number, text: string, rawMap: Partial<Record<ManifestKey, unknown>>): ManifestPreview | ManifestFileError {
	const table = parseCsvTable(text);
	if (!table.ok) return table;
	return previewFromTable(db, lotId, table.value, rawMap);
}

export type ImportResult =
	| { ok: true; serials: string[]; skipped: ManifestCheck['bad'] }
	| { ok: false; message: string; preview?: ManifestPreview };

/**
 * Import the good rows in one transaction, skipping the bad ones. The person confirmed a
 * preview with `expectedGood` good rows; if the lot changed meanwhile (another import, a unit
 * added by hand) and the count differs, nothing is imported and the fresh preview comes back.
 */
export function importManifest(
	db: Db,
	actor: Actor,
	lotId: number,
	text: string,
	rawMap: Partial<Record<ManifestKey, unknown>>,
	expectedGood: number,
	now: Date = new Date()
): ImportResult {
	const table = parseCsvTable(text);
	if (!table.ok) return table;
	return db.transaction(
		(tx): ImportResult => {
			const preview = previewFromTable(tx, lotId, table.value, rawMap);
			if (!preview.check) return { ok: false, message: 'Choose the columns first.', preview };
			if (preview.check.good.length === 0) return { ok: false, message: 'No row can be imported; fix the rows listed and upload again.', preview };
			if (preview.check.good.length !== expectedGood) {
				return {
					ok: false,
					message: `The lot changed since the preview: ${preview.check.good.length} rows can be imported now, not ${expectedGood}. Check the list and confirm again.`,
					preview
				};
			}
			const serials = receiveUnits(
				db,
				actor,
				lotId,
				preview.check.good.map((r) => ({ modelId: r.modelId, originalTag: r.originalTag, notes: r.notes })),
				now
			);
			return { ok: true, serials, skipped: preview.check.bad };
		},
		{ behavior: 'immediate' }
	);
}

export function findLotId(db: DbOrTx, code: string): number | null {
	return db.select({ id: coreLot.id }).from(coreLot).where(eq(coreLot.code, code)).get()?.id ?? null;
}
