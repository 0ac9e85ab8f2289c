/**
 * Which cores to buy: scrap and accept counts, price and the labour before the verdict per
 * group of lots (supplier, lot, model or source type), aggregated in SQL; the decisions on top
 * are the pure functions in `domain/buying` (Newcombe difference, cost per good core with its
 * range, the next skid).
 *
 * Counts come from `lot_tally` (judged = received − waiting, accepted = judged − scrapped, as in
 * the scrap report). The price per core is the lots' price weighted by cores received. The labour
 * before the verdict is every `labourMinutes` recorded on the inspect / accept / scrap entries
 * of units that have their verdict, spread over the cores judged.
 */
import { and, eq, gte, inArray, isNotNull, lte, notInArray, sql, type SQL, type SQLWrapper } from 'drizzle-orm';
import { costPerGood, rankByUpper, type CostPerGood } from '../../domain/buying/cost-per-good';
import { differenceSentence, newcombeDifference, type Difference } from '../../domain/buying/newcombe';
import { priceSkid, type SkidQuote } from '../../domain/buying/skid';
import { labourCents } from '../../domain/stats/money';
import type { DbOrTx } from '../db';
import { jsonPositiveNumber } from '../db/report-sql';
import { coreLot, LOT_SOURCES, lotTally, supplier, turboModel, unit, unitEvent, type LotSource } from '../db/schema';
import type { ReportFilter } from './filter';
import { SOURCE_LABEL, VERDICT_LABOUR_ACTIONS, WAITING_STATES } from './scrap';
import { labourRateCents } from './settings';

export const GROUP_KINDS = ['supplier', 'lot', 'model', 'source'] as const;
export type GroupKind = (typeof GROUP_KINDS)[number];

export interface GroupCounts {
	key: string;
	label: string;
	received: number;
	judged: number;
	scrapped: number;
	accepted: number;
	/** Σ cores received × price per core, in cents. */
	pricePaidCents: number;
	/** Labour before the verdict on the judged cores, in minutes. */
	labourMinutes: number;
}

export type BuyingFilter = Pick<ReportFilter, 'from' | 'to' | 'model' | 'source'>;

function lotWhere(filter: BuyingFilter): SQL[] {
	const where: SQL[] = [];
	if (filter.from) where.push(gte(coreLot.receivedOn, filter.from));
	if (filter.to) where.push(lte(coreLot.receivedOn, filter.to));
	if (filter.source) where.push(eq(coreLot.source, filter.source));
	return where;
}

function keyColumn(kind: GroupKind, modelCol: SQLWrapper): SQLWrapper {
	return kind === 'supplier' ? coreLot.supplierId : kind === 'lot' ? coreLot.id : kind === 'model' ? modelCol : coreLot.source;
}

/** Counts, price and labour per group; only groups with at least one core received. */
export function buyingGroups(db: DbOrTx, kind: GroupKind, filter: BuyingFilter = {}, only?: readonly string[]): GroupCounts[] {
	const mId = filter.model ? (db.select({ id: turboModel.id }).from(turboModel).where(eq(turboModel.code, filter.model)).get()?.id ?? -1) : undefined;
	const base = lotWhere(filter);
	if (kind === 'supplier') base.push(isNotNull(coreLot.supplierId));
	const tallyWhere = [...base, ...(mId !== undefined ? [eq(lotTally.modelId, mId)] : [])];
	const tallyKey = keyColumn(kind, lotTally.modelId);
	if (only) tallyWhere.push(inArray(sql`${tallyKey}`, [...only].map((k) => (kind === 'source' ? k : Number(k)))));
	const sum = (e: SQL) => sql<number>`coalesce(sum(${e}), 0)`.mapWith(Number);
	const counts = db
		.select({
			key: sql<string>`${tallyKey}`.mapWith(String),
			received: sum(sql`${lotTally.received}`),
			waiting: sum(sql`${lotTally.waiting}`),
			scrapped: sum(sql`${lotTally.scrapped}`),
			paid: sum(sql`${lotTally.received} * ${coreLot.costPerCoreCents}`)
		})
		.from(lotTally)
		.innerJoin(coreLot, eq(coreLot.id, lotTally.lotId))
		.where(and(...tallyWhere))
		.groupBy(sql`${tallyKey}`)
		.having(sql`sum(${lotTally.received}) > 0`)
		.all();

	const eventKey = keyColumn(kind, unit.modelId);
	const labourWhere = [
		...base,
		inArray(unitEvent.action, [...VERDICT_LABOUR_ACTIONS]),
		notInArray(unit.state, [...WAITING_STATES]),
		...(mId !== undefined ? [eq(unit.modelId, mId)] : []),
		...(only ? [inArray(sql`${eventKey}`, [...only].map((k) => (kind === 'source' ? k : Number(k))))] : [])
	];
	const labour = new Map(
		db
			.select({ key: sql<string>`${eventKey}`.mapWith(String), minutes: sum(jsonPositiveNumber(unitEvent.data, 'labourMinutes')) })
			.from(unitEvent)
			.innerJoin(unit, eq(unit.id, unitEvent.unitId))
			.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
			.where(and(...labourWhere))
			.groupBy(sql`${eventKey}`)
			.all()
			.map((r) => [r.key, r.minutes])
	);
	const labels = groupLabels(db, kind, counts.map((c) => c.key));
	return counts
		.map((c) => {
			const judged = c.received - c.waiting;
			return {
				key: c.key,
				label: labels.get(c.key) ?? c.key,
				received: c.received,
				judged,
				scrapped: c.scrapped,
				accepted: judged - c.scrapped,
				pricePaidCents: c.paid,
				labourMinutes: labour.get(c.key) ?? 0
			};
		})
		.sort((a, b) => a.label.localeCompare(b.label));
}

function groupLabels(db: DbOrTx, kind: GroupKind, keys: string[]): Map<string, string> {
	if (kind === 'source') return new Map(LOT_SOURCES.map((s) => [s, SOURCE_LABEL[s as LotSource]]));
	const ids = keys.map(Number);
	if (ids.length === 0) return new Map();
	const rows =
		kind === 'supplier'
			? db.select({ id: supplier.id, label: supplier.name }).from(supplier).where(inArray(supplier.id, ids)).all()
			: kind === 'lot'
				? db.select({ id: coreLot.id, label: coreLot.code }).from(coreLot).where(inArray(coreLot.id, ids)).all()
				: db.select({ id: turboModel.id, label: turboModel.code }).from(turboModel).where(inArray(turboModel.id, ids)).all();
	return new Map(rows.map((r) => [String(r.id), r.label]));
}

/** Price per core received and labour per core judged, in cents. */
export function perCore(g: GroupCounts, rateCentsPerHour: number): { priceCents: number; labourCents: number } {
	return {
		priceCents: g.received ? g.pricePaidCents / g.received : 0,
		labourCents: g.judged ? labourCents(g.labourMinutes, rateCentsPerHour) / g.judged : 0
	};
}

export interface Comparison {
	kind: GroupKind;
	a: GroupCounts;
	b: GroupCounts;
	difference: Difference | null;
	sentence: string;
}

/** Two groups' scrap rates compared; null when either group has no cores in the view. */
export function compareGroups(db: DbOrTx, kind: GroupKind, a: string, b: string, filter: BuyingFilter = {}): Comparison | null {
	const groups = buyingGroups(db, kind, filter, [a, b]);
	const ga = groups.find((g) => g.key === a);
	const gb = groups.find((g) => g.key === b);
	if (!ga || !gb) return null;
	const difference = newcombeDifference(ga.scrapped, ga.judged, gb.scrapped, gb.judged);
	return { kind, a: ga, b: gb, difference, sentence: differenceSentence(ga.label, gb.label, difference) };
}

export interface CostRow extends GroupCounts {
	priceCents: number;
	labourCents: number;
	cost: CostPerGood;
}

/** Cost per good core with its range per group, ranked by the upper end (cheapest worst case first). */
export function costPerGoodReport(db: DbOrTx, kind: GroupKind, filter: BuyingFilter = {}): { kind: GroupKind; labourRateCentsPerHour: number; rows: CostRow[] } {
	const rate = labourRateCents(db);
	const rows = buyingGroups(db, kind, filter).map((g) => {
		const pc = perCore(g, rate);
		return { ...g, ...pc, cost: costPerGood({ ...pc, accepted: g.accepted, judged: g.judged }) };
	});
	return { kind, labourRateCentsPerHour: rate, rows: rankByUpper(rows) };
}

export interface SkidRequest {
	supplier: number;
	model?: string;
	cores: number;
	priceCents: number;
	label?: string;
}

export interface SkidAnswer {
	history: GroupCounts & { priceCents: number; labourCents: number };
	quote: SkidQuote;
	model: string | null;
}

/** The next skid from a supplier, priced on that supplier's history (for one model, when chosen). */
export function skidQuote(db: DbOrTx, req: SkidRequest): SkidAnswer | null {
	const rate = labourRateCents(db);
	const name = db.select({ name: supplier.name }).from(supplier).where(eq(supplier.id, req.supplier)).get()?.name;
	if (!name) return null;
	const g =
		buyingGroups(db, 'supplier', { model: req.model }, [String(req.supplier)])[0] ??
		({ key: String(req.supplier), label: name, received: 0, judged: 0, scrapped: 0, accepted: 0, pricePaidCents: 0, labourMinutes: 0 } satisfies GroupCounts);
	const pc = perCore(g, rate);
	const quote = priceSkid({ label: req.label ?? `${name}${req.model ? ` · ${req.model}` : ''}`, cores: req.cores, priceCents: req.priceCents, labourCents: pc.labourCents, accepted: g.accepted, judged: g.judged });
	return { history: { ...g, ...pc }, quote, model: req.model ?? null };
}
