/**
 * Scrap per core lot: counts per lot straight from the unit rows (the unit row is the cache of
 * its history, so its state says whether the verdict is in), scrap reasons from each scrapped
 * unit's last scrap event, labour before the verdict from the optional `labourMinutes` of the
 * inspect / accept / scrap events. All aggregation happens in SQL; the statistics on top are
 * the pure functions in `domain/stats`.
 */
import { and, eq, gte, inArray, lte, sql, type SQL } from 'drizzle-orm';
import { labourCents } from '../../domain/stats/money';
import { pChart, type PChartSignal } from '../../domain/stats/p-chart';
import { wilsonInterval } from '../../domain/stats/proportion';
import type { DbOrTx } from '../db';
import { jsonPositiveNumber, jsonText } from '../db/report-sql';
import { coreLot, scrapReason, supplier, turboModel, unit, unitEvent, type LotSource } from '../db/schema';
import type { ReportFilter } from './filter';
import { labourRateCents } from './settings';

/** States in which a unit still waits for its teardown verdict. */
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
	signal: PChartSignal;
	/** Reasons behind the scrap, most frequent first (filled for every lot). */
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

export interface ScrapReport {
	filter: ReportFilter;
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

const isWaiting = sql`${unit.state} in ('received', 'inspected')`;
const isScrapped = sql`${unit.state} = 'scrapped'`;

/** The last scrap event of each unit (a scrap could in principle be undone and made again). */
function lastScrapEvents(db: DbOrTx) {
	return db
		.select({ unitId: unitEvent.unitId, eventId: sql<number>`max(${unitEvent.id})`.as('event_id') })
		.from(unitEvent)
		.where(eq(unitEvent.action, 'scrap'))
		.groupBy(unitEvent.unitId)
		.as('last_scrap');
}

export function scrapReport(db: DbOrTx, filter: ReportFilter): ScrapReport {
	const mId = modelId(db, filter.model);
	const rate = labourRateCents(db);
	const lotWhere = lotConditions(filter);
	const unitJoin = mId === undefined ? eq(unit.lotId, coreLot.id) : and(eq(unit.lotId, coreLot.id), eq(unit.modelId, mId ?? -1));
	const empty = mId === null; // a model code that does not exist matches nothing

	// One pass over the units, grouped by lot and model (covering index); lots and models are
	// then summed from these few thousand rows.
	const tallies = empty
		? []
		: db
				.select({
					lotId: unit.lotId,
					modelId: unit.modelId,
					received: sql<number>`count(*)`,
					waiting: sql<number>`sum(case when ${isWaiting} then 1 else 0 end)`,
					scrapped: sql<number>`sum(case when ${isScrapped} then 1 else 0 end)`
				})
				.from(unit)
				.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
				.where(and(...lotWhere, ...(mId !== undefined ? [eq(unit.modelId, mId ?? -1)] : [])))
				.groupBy(unit.lotId, unit.modelId)
				.all();
	const perLot = new Map<number, { received: number; waiting: number; scrapped: number }>();
	for (const t of tallies) {
		const p = perLot.get(t.lotId) ?? { received: 0, waiting: 0, scrapped: 0 };
		p.received += t.received;
		p.waiting += t.waiting;
		p.scrapped += t.scrapped;
		perLot.set(t.lotId, p);
	}
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
					costPerCoreCents: coreLot.costPerCoreCents
				})
				.from(coreLot)
				.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
				.where(lotWhere.length ? and(...lotWhere) : undefined)
				.orderBy(coreLot.receivedOn, coreLot.id)
				.all()
				.map((l) => ({ ...l, ...(perLot.get(l.id) ?? { received: 0, waiting: 0, scrapped: 0 }) }))
				.filter((r) => mId === undefined || r.received > 0);

	const unitWhere = [...lotWhere, isScrapped, ...(mId !== undefined ? [eq(unit.modelId, mId ?? -1)] : [])];

	// Labour recorded before the verdict on the scrapped units, per lot.
	const labour = new Map<number, number>();
	const labourByModel = new Map<number, number>();
	for (const r of db
		.select({ lotId: unit.lotId, modelId: unit.modelId, minutes: sql<number>`sum(${jsonPositiveNumber(unitEvent.data, 'labourMinutes')})` })
		.from(unitEvent)
		.innerJoin(unit, eq(unit.id, unitEvent.unitId))
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.where(and(inArray(unitEvent.action, [...VERDICT_LABOUR_ACTIONS]), ...unitWhere))
		.groupBy(unit.lotId, unit.modelId)
		.all()) {
		labour.set(r.lotId, (labour.get(r.lotId) ?? 0) + (r.minutes ?? 0));
		labourByModel.set(r.modelId, (labourByModel.get(r.modelId) ?? 0) + (r.minutes ?? 0));
	}

	// Scrap reasons per lot, from each scrapped unit's last scrap event.
	const last = lastScrapEvents(db);
	const reasonCode = sql<string>`coalesce(${jsonText(unitEvent.data, 'reasonCode')}, '(none)')`;
	const reasonRows = db
		.select({ lotId: unit.lotId, code: reasonCode.as('code'), count: sql<number>`count(*)` })
		.from(last)
		.innerJoin(unitEvent, eq(unitEvent.id, last.eventId))
		.innerJoin(unit, eq(unit.id, last.unitId))
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.where(and(...unitWhere))
		.groupBy(unit.lotId, sql`code`)
		.all();
	const labels = new Map(db.select({ code: scrapReason.code, label: scrapReason.label }).from(scrapReason).all().map((r) => [r.code, r.label]));
	const label = (code: string) => labels.get(code) ?? (code === '(none)' ? 'No reason recorded' : code);
	const reasonsByLot = new Map<number, { code: string; label: string; count: number }[]>();
	const reasonTotals = new Map<string, number>();
	for (const r of reasonRows) {
		const list = reasonsByLot.get(r.lotId) ?? [];
		list.push({ code: r.code, label: label(r.code), count: r.count });
		reasonsByLot.set(r.lotId, list);
		reasonTotals.set(r.code, (reasonTotals.get(r.code) ?? 0) + r.count);
	}
	for (const list of reasonsByLot.values()) list.sort((a, b) => b.count - a.count || a.code.localeCompare(b.code));

	const base = counts.map((c) => {
		const judged = c.received - c.waiting;
		const accepted = judged - c.scrapped;
		const minutes = labour.get(c.id) ?? 0;
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
				judged: sql<number>`coalesce(sum(case when ${isWaiting} then 0 else 1 end), 0)`,
				scrapped: sql<number>`coalesce(sum(case when ${isScrapped} then 1 else 0 end), 0)`
			})
			.from(unit)
			.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
			.where(and(...shopWhere, ...(mId !== undefined ? [eq(unit.modelId, mId ?? -1)] : [])))
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
			reasons: reasonsByLot.get(b.id) ?? []
		};
	});

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

	const lotCost = new Map(counts.map((l) => [l.id, l.costPerCoreCents]));
	const modelCodes = new Map(db.select({ id: turboModel.id, code: turboModel.code }).from(turboModel).all().map((m) => [m.id, m.code]));
	const modelAgg = new Map<number, { judged: number; scrapped: number; scrapCore: number }>();
	for (const t of tallies) {
		const m = modelAgg.get(t.modelId) ?? { judged: 0, scrapped: 0, scrapCore: 0 };
		m.judged += t.received - t.waiting;
		m.scrapped += t.scrapped;
		m.scrapCore += t.scrapped * (lotCost.get(t.lotId) ?? 0);
		modelAgg.set(t.modelId, m);
	}
	const byModel: Breakdown[] = [...modelAgg.entries()]
		.map(([id, r]) => {
			const code = modelCodes.get(id) ?? String(id);
			return { key: code, label: code, judged: r.judged, scrapped: r.scrapped, scrap: rateCI(r.scrapped, r.judged), scrapCostCents: r.scrapCore + labourCents(labourByModel.get(id) ?? 0, rate) };
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
		pBar: chart.pBar,
		lots,
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

export const SOURCE_LABEL: Record<LotSource, string> = {
	purchased_skid: 'Purchased skid',
	customer_return: 'Customer unit',
	warranty_return: 'Warranty return'
};
