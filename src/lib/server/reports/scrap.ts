/**
 * Scrap per core lot. The counts come from `lot_tally` and `lot_scrap_reason_tally`, which the
 * database keeps per lot and model in the same transaction as every change to a unit or its
 * history (drizzle/0011): units per state class, scrapped units by the reason of their latest
 * scrap entry, and the labour recorded before the verdict (the optional `labourMinutes` of the
 * inspect / accept / scrap entries) on the scrapped ones. All aggregation happens in SQL; the
 * statistics on top are the pure functions in `domain/stats`.
 */
import { and, eq, gt, gte, inArray, lte, sql, type SQL, type SQLWrapper } from 'drizzle-orm';
import { labourCents } from '../../domain/stats/money';
import { pChart, type PChartSignal } from '../../domain/stats/p-chart';
import { wilsonInterval } from '../../domain/stats/proportion';
import type { DbOrTx } from '../db';
import { coreLot, lotScrapReasonTally, lotTally, scrapReason, supplier, turboModel, type LotSource } from '../db/schema';
import type { ReportFilter } from './filter';
import { labourRateCents } from './settings';

/** States in which a unit still waits for its teardown verdict (the tally triggers in drizzle/0011 use the same lists). */
export const WAITING_STATES = ['received', 'inspected'] as const;
/** Moves whose `labourMinutes` count as labour before the verdict. */
export const VERDICT_LABOUR_ACTIONS = ['inspect', 'accept', 'scrap'] as const;

export interface RateCI {
	rate: number | null;
	low: number | null;
	high: number | null;
}

export interface LotRow {
	id: number;
	code: string;
	receivedOn: string;
	source: LotSource;
	supplierId: number | null;
	supplier: string | null;
	costPerCoreCents: number;
	received: number;
	/** Verdict in: accepted + scrapped. */
	judged: number;
	accepted: number;
	scrapped: number;
	waiting: number;
	scrap: RateCI;
	labourMinutesScrapped: number;
	/** Core cost of the scrapped units plus the labour recorded on them before the verdict. */
	scrapCostCents: number;
	/** Cores received × cost per core, plus the labour recorded on the scrapped ones. */
	lotCostCents: number;
	costPerGoodCents: number | null;
	ucl: number | null;
	lcl: number | null;
	/** The p-chart's word for the lot: above / below / within its limits, `too_few` when n·p̄ < 1 (the limits say nothing about so small a lot), `none` without verdicts. */
	signal: PChartSignal;
	/** For a lot above the upper limit, the reasons behind its scrap, most frequent first; empty otherwise (the lot's page has them all). Filled for the rows returned. */
	reasons: { code: string; label: string; count: number }[];
}

export interface Breakdown {
	key: string;
	label: string;
	judged: number;
	scrapped: number;
	scrap: RateCI;
	scrapCostCents: number;
}

/** How the lot table is cut: sorted by a column, one page of it (or every lot, for an export). */
export const LOT_SORTS = ['receivedOn', 'code', 'rate', 'scrapCost', 'costPerGood'] as const;
export type LotSort = (typeof LOT_SORTS)[number];
export interface LotView {
	sort: LotSort;
	dir: 'asc' | 'desc';
	page: number;
	/** Rows per page, or every lot. */
	per: number | 'all';
	/** Only this lot (the lot's own page); counts and limits are still those of the whole view. */
	lotId?: number;
}
/** Every lot in the order received: what the other reports build on. */
export const ALL_LOTS: LotView = { sort: 'receivedOn', dir: 'asc', page: 1, per: 'all' };
/** How many of the latest lots the p-chart draws; the limits and signals use every lot in the view. */
export const CHART_LOTS = 250;

export interface ChartPoint {
	code: string;
	n: number;
	rate: number | null;
	ucl: number | null;
	signal: PChartSignal;
}

export interface ScrapReport {
	filter: ReportFilter;
	/** The lot table's page: `lots` holds its rows; `total` counts every lot in the view. */
	lotPage: { sort: LotSort; dir: 'asc' | 'desc'; page: number; per: number | 'all'; pages: number; total: number };
	/** The lots above their upper limit: how many, and the worst few by scrap rate; and how many lots are too small to judge. */
	flagged: { total: number; worst: { code: string; rate: number }[]; tooFew: number };
	/** The latest lots of the view in the order received, for the p-chart. */
	chart: ChartPoint[];
	labourRateCentsPerHour: number;
	totals: { lots: number; received: number; judged: number; accepted: number; scrapped: number; waiting: number; scrap: RateCI; scrapCostCents: number; lotCostCents: number; costPerGoodCents: number | null };
	pBar: number | null;
	lots: LotRow[];
	reasons: { code: string; label: string; count: number; cumulativeShare: number }[];
	bySupplier: Breakdown[];
	byModel: Breakdown[];
	bySource: Breakdown[];
}

export function rateCI(x: number, n: number): RateCI {
	const ci = wilsonInterval(x, n);
	return { rate: n ? x / n : null, low: ci?.low ?? null, high: ci?.high ?? null };
}

/** Conditions on lots (and on units, for the model) shared by every query below. */
function lotConditions(filter: ReportFilter): SQL[] {
	const where: SQL[] = [];
	if (filter.from) where.push(gte(coreLot.receivedOn, filter.from));
	if (filter.to) where.push(lte(coreLot.receivedOn, filter.to));
	if (filter.supplier) where.push(eq(coreLot.supplierId, filter.supplier));
	if (filter.source) where.push(eq(coreLot.source, filter.source));
	return where;
}

function modelId(db: DbOrTx, code: string | undefined): number | null | undefined {
	if (!code) return undefined;
	return db.select({ id: turboModel.id }).from(turboModel).where(eq(turboModel.code, code)).get()?.id ?? null;
}

export function scrapReport(db: DbOrTx, filter: ReportFilter, view: LotView = ALL_LOTS): ScrapReport {
	const mId = modelId(db, filter.model);
	const rate = labourRateCents(db);
	const lotWhere = lotConditions(filter);
	const empty = mId === null; // a model code that does not exist matches nothing

	// The per-lot-and-model tallies the database keeps (drizzle/0011): a few thousand rows, not
	// the history, summed per lot here and per model below.
	const modelWhere = mId !== undefined ? [eq(lotTally.modelId, mId ?? -1)] : [];
	const sum = (col: SQLWrapper) => sql<number>`coalesce(sum(${col}), 0)`.mapWith(Number);
	const counts = empty
		? []
		: db
				.select({
					id: coreLot.id,
					code: coreLot.code,
					receivedOn: coreLot.receivedOn,
					source: coreLot.source,
					supplierId: coreLot.supplierId,
					supplier: supplier.name,
					costPerCoreCents: coreLot.costPerCoreCents,
					received: sum(lotTally.received),
					waiting: sum(lotTally.waiting),
					scrapped: sum(lotTally.scrapped),
					minutes: sum(lotTally.scrapLabourMinutes)
				})
				.from(coreLot)
				.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
				.leftJoin(lotTally, and(eq(lotTally.lotId, coreLot.id), ...modelWhere))
				.where(lotWhere.length ? and(...lotWhere) : undefined)
				.groupBy(coreLot.id)
				.having(mId === undefined ? undefined : sql`coalesce(sum(${lotTally.received}), 0) > 0`)
				.orderBy(coreLot.receivedOn, coreLot.id)
				.all();

	// Scrap reasons, from each scrapped unit's latest scrap entry: the shop's Pareto here, and
	// per lot below for the lots above the upper limit (the reasons that drove them).
	const reasonWhere = (extra: SQL[] = []) =>
		and(...lotWhere, ...(mId !== undefined ? [eq(lotScrapReasonTally.modelId, mId ?? -1)] : []), gt(lotScrapReasonTally.units, 0), ...extra);
	const reasonTotalRows = empty
		? []
		: db
				.select({ code: lotScrapReasonTally.reasonCode, count: sql<number>`sum(${lotScrapReasonTally.units})` })
				.from(lotScrapReasonTally)
				.innerJoin(coreLot, eq(coreLot.id, lotScrapReasonTally.lotId))
				.where(reasonWhere())
				.groupBy(lotScrapReasonTally.reasonCode)
				.all();
	const labels = new Map(db.select({ code: scrapReason.code, label: scrapReason.label }).from(scrapReason).all().map((r) => [r.code, r.label]));
	const label = (code: string) => labels.get(code) ?? (code === '(none)' ? 'No reason recorded' : code);
	const reasonTotals = new Map(reasonTotalRows.map((r) => [r.code, r.count]));

	const base = counts.map((c) => {
		const judged = c.received - c.waiting;
		const accepted = judged - c.scrapped;
		const minutes = c.minutes;
		const labourCost = labourCents(minutes, rate);
		const scrapCost = c.scrapped * c.costPerCoreCents + labourCost;
		const lotCost = c.received * c.costPerCoreCents + labourCost;
		return { ...c, judged, accepted, minutes, scrapCost, lotCost };
	});
	// The centre line is the shop's rate over the same dates, sources and model, whatever the
	// supplier filter: one supplier's lots are judged against the shop, not against themselves.
	let standard: number | null | undefined;
	if (filter.supplier && !empty) {
		const { supplier: _ignored, ...rest } = filter;
		const shopWhere = lotConditions(rest);
		const shop = db
			.select({
				judged: sql<number>`coalesce(sum(${lotTally.received} - ${lotTally.waiting}), 0)`,
				scrapped: sql<number>`coalesce(sum(${lotTally.scrapped}), 0)`
			})
			.from(lotTally)
			.innerJoin(coreLot, eq(coreLot.id, lotTally.lotId))
			.where(and(...shopWhere, ...modelWhere))
			.get();
		standard = shop && shop.judged ? shop.scrapped / shop.judged : null;
	}
	const chart = pChart(
		base.map((b) => ({ n: b.judged, defects: b.scrapped })),
		3,
		standard
	);
	const lots: LotRow[] = base.map((b, i) => {
		const pt = chart.points[i];
		return {
			id: b.id,
			code: b.code,
			receivedOn: b.receivedOn,
			source: b.source,
			supplierId: b.supplierId,
			supplier: b.supplier,
			costPerCoreCents: b.costPerCoreCents,
			received: b.received,
			judged: b.judged,
			accepted: b.accepted,
			scrapped: b.scrapped,
			waiting: b.waiting,
			scrap: rateCI(b.scrapped, b.judged),
			labourMinutesScrapped: b.minutes,
			scrapCostCents: b.scrapCost,
			lotCostCents: b.lotCost,
			costPerGoodCents: b.accepted > 0 ? b.lotCost / b.accepted : null,
			ucl: pt.signal === 'none' ? null : pt.ucl,
			lcl: pt.signal === 'none' ? null : pt.lcl,
			signal: pt.signal,
			reasons: []
		};
	});
	const shown = cutLots(lots, view);

	// The reasons behind each flagged lot, for the rows returned only.
	const flaggedIds = shown.rows.filter((l) => l.signal === 'above').map((l) => l.id);
	const reasonsByLot = new Map<number, { code: string; label: string; count: number }[]>();
	for (let i = 0; i < flaggedIds.length; i += 500) {
		const rows = db
			.select({ lotId: lotScrapReasonTally.lotId, code: lotScrapReasonTally.reasonCode, count: sql<number>`sum(${lotScrapReasonTally.units})` })
			.from(lotScrapReasonTally)
			.innerJoin(coreLot, eq(coreLot.id, lotScrapReasonTally.lotId))
			.where(reasonWhere([inArray(lotScrapReasonTally.lotId, flaggedIds.slice(i, i + 500))]))
			.groupBy(lotScrapReasonTally.lotId, lotScrapReasonTally.reasonCode)
			.all();
		for (const r of rows) {
			const list = reasonsByLot.get(r.lotId) ?? [];
			list.push({ code: r.code, label: label(r.code), count: r.count });
			reasonsByLot.set(r.lotId, list);
		}
	}
	for (const list of reasonsByLot.values()) list.sort((a, b) => b.count - a.count || a.code.localeCompare(b.code));
	const rows = shown.rows.map((l) => (reasonsByLot.has(l.id) ? { ...l, reasons: reasonsByLot.get(l.id)! } : l));
	const flagged = lots.filter((l) => l.signal === 'above');

	const totalScrapped = lots.reduce((s, l) => s + l.scrapped, 0);
	const reasons = [...reasonTotals.entries()]
		.sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))
		.reduce<{ code: string; label: string; count: number; cumulativeShare: number }[]>((acc, [code, count]) => {
			const before = acc.length ? acc[acc.length - 1].cumulativeShare * totalScrapped : 0;
			acc.push({ code, label: label(code), count, cumulativeShare: totalScrapped ? (before + count) / totalScrapped : 0 });
			return acc;
		}, []);

	const group = (keyOf: (l: LotRow) => string, labelOf: (l: LotRow) => string): Breakdown[] => {
		const m = new Map<string, Breakdown>();
		for (const l of lots) {
			const k = keyOf(l);
			const g = m.get(k) ?? { key: k, label: labelOf(l), judged: 0, scrapped: 0, scrap: rateCI(0, 0), scrapCostCents: 0 };
			g.judged += l.judged;
			g.scrapped += l.scrapped;
			g.scrapCostCents += l.scrapCostCents;
			m.set(k, g);
		}
		return [...m.values()].map((g) => ({ ...g, scrap: rateCI(g.scrapped, g.judged) })).sort((a, b) => a.label.localeCompare(b.label));
	};

	const modelCodes = new Map(db.select({ id: turboModel.id, code: turboModel.code }).from(turboModel).all().map((m) => [m.id, m.code]));
	const modelRows = empty
		? []
		: db
				.select({
					modelId: lotTally.modelId,
					judged: sum(sql`${lotTally.received} - ${lotTally.waiting}`),
					scrapped: sum(lotTally.scrapped),
					scrapCore: sum(sql`${lotTally.scrapped} * ${coreLot.costPerCoreCents}`),
					minutes: sum(lotTally.scrapLabourMinutes)
				})
				.from(lotTally)
				.innerJoin(coreLot, eq(coreLot.id, lotTally.lotId))
				.where(and(...lotWhere, ...modelWhere))
				.groupBy(lotTally.modelId)
				.having(sql`sum(${lotTally.received}) > 0`)
				.all();
	const byModel: Breakdown[] = modelRows
		.map((r) => {
			const code = modelCodes.get(r.modelId) ?? String(r.modelId);
			return { key: code, label: code, judged: r.judged, scrapped: r.scrapped, scrap: rateCI(r.scrapped, r.judged), scrapCostCents: r.scrapCore + labourCents(r.minutes, rate) };
		})
		.sort((a, b) => a.label.localeCompare(b.label));

	const t = lots.reduce(
		(s, l) => ({
			received: s.received + l.received,
			judged: s.judged + l.judged,
			accepted: s.accepted + l.accepted,
			scrapped: s.scrapped + l.scrapped,
			waiting: s.waiting + l.waiting,
			scrapCostCents: s.scrapCostCents + l.scrapCostCents,
			lotCostCents: s.lotCostCents + l.lotCostCents
		}),
		{ received: 0, judged: 0, accepted: 0, scrapped: 0, waiting: 0, scrapCostCents: 0, lotCostCents: 0 }
	);

	return {
		filter,
		labourRateCentsPerHour: rate,
		totals: { lots: lots.length, ...t, scrap: rateCI(t.scrapped, t.judged), costPerGoodCents: t.accepted ? t.lotCostCents / t.accepted : null },
		lotPage: { sort: view.sort, dir: view.dir, page: shown.page, per: view.per, pages: shown.pages, total: lots.length },
		flagged: {
			total: flagged.length,
			worst: flagged
				.sort((a, b) => (b.scrap.rate ?? 0) - (a.scrap.rate ?? 0) || a.code.localeCompare(b.code))
				.slice(0, 12)
				.map((l) => ({ code: l.code, rate: l.scrap.rate ?? 0 })),
			tooFew: lots.filter((l) => l.signal === 'too_few').length
		},
		chart: lots.slice(-CHART_LOTS).map((l) => ({ code: l.code, n: l.judged, rate: l.scrap.rate, ucl: l.ucl, signal: l.signal })),
		pBar: chart.pBar,
		lots: rows,
		reasons,
		bySupplier: group(
			(l) => (l.supplierId === null ? 'none' : String(l.supplierId)),
			(l) => l.supplier ?? 'No supplier (returns)'
		),
		byModel,
		bySource: group(
			(l) => l.source,
			(l) => SOURCE_LABEL[l.source]
		)
	};
}

const sortValue = (l: LotRow, k: LotSort): string | number =>
	k === 'receivedOn' ? l.receivedOn : k === 'code' ? l.code : k === 'rate' ? (l.scrap.rate ?? -1) : k === 'scrapCost' ? l.scrapCostCents : (l.costPerGoodCents ?? Number.POSITIVE_INFINITY);

/**
 * The rows of the lot table for a view: sorted on the chosen column (ties in the order
 * received), then one page of them. A page past the end gives the last page.
 */
export function cutLots(lots: readonly LotRow[], view: LotView): { rows: LotRow[]; page: number; pages: number } {
	if (view.lotId !== undefined) return { rows: lots.filter((l) => l.id === view.lotId), page: 1, pages: 1 };
	const order = lots.map((l, i) => ({ l, i, v: sortValue(l, view.sort) }));
	const dir = view.dir === 'asc' ? 1 : -1;
	order.sort((a, b) => (a.v < b.v ? -dir : a.v > b.v ? dir : a.i - b.i));
	if (view.per === 'all') return { rows: order.map((o) => o.l), page: 1, pages: 1 };
	const pages = Math.max(1, Math.ceil(lots.length / view.per));
	const page = Math.min(Math.max(1, view.page), pages);
	return { rows: order.slice((page - 1) * view.per, page * view.per).map((o) => o.l), page, pages };
}

export const SOURCE_LABEL: Record<LotSource, string> = {
	purchased_skid: 'Purchased skid',
	customer_return: 'Customer unit',
	warranty_return: 'Warranty return'
};
