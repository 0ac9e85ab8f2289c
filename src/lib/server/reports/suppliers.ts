/**
 * Supplier comparison, built on the per-lot aggregates of the scrap report: lots, cores, scrap
 * rate with its Wilson interval, cost per good core, and a monthly trend. A supplier's latest
 * month is called "rising" or "falling" only when its interval excludes the supplier's own rate
 * over the whole period; otherwise "steady".
 */
import { wilsonInterval } from '../../domain/stats/proportion';
import type { DbOrTx } from '../db';
import type { ReportFilter } from './filter';
import { rateCI, scrapReport, type RateCI } from './scrap';

export type Trend = 'rising' | 'falling' | 'steady' | 'unknown';

export interface SupplierRow {
	supplierId: number;
	supplier: string;
	lots: number;
	cores: number;
	judged: number;
	scrapped: number;
	accepted: number;
	scrap: RateCI;
	costPerGoodCents: number | null;
	flaggedLots: number;
	months: { month: string; judged: number; scrapped: number; rate: number | null }[];
	trend: Trend;
}

export function trendOf(overall: { scrapped: number; judged: number }, latest: { scrapped: number; judged: number } | undefined): Trend {
	if (!latest || latest.judged === 0 || overall.judged === 0) return 'unknown';
	const ci = wilsonInterval(latest.scrapped, latest.judged)!;
	const p = overall.scrapped / overall.judged;
	if (ci.low > p) return 'rising';
	if (ci.high < p) return 'falling';
	return 'steady';
}

export function supplierReport(db: DbOrTx, filter: Omit<ReportFilter, 'supplier' | 'source'>): { filter: typeof filter; suppliers: SupplierRow[] } {
	const report = scrapReport(db, { ...filter, source: 'purchased_skid' });
	const m = new Map<number, SupplierRow & { lotCost: number }>();
	for (const l of report.lots) {
		if (l.supplierId === null) continue;
		const row =
			m.get(l.supplierId) ??
			({ supplierId: l.supplierId, supplier: l.supplier ?? '', lots: 0, cores: 0, judged: 0, scrapped: 0, accepted: 0, scrap: rateCI(0, 0), costPerGoodCents: null, flaggedLots: 0, months: [], trend: 'unknown', lotCost: 0 } as SupplierRow & { lotCost: number });
		row.lots += 1;
		row.cores += l.received;
		row.judged += l.judged;
		row.scrapped += l.scrapped;
		row.accepted += l.accepted;
		row.lotCost += l.lotCostCents;
		if (l.signal === 'above') row.flaggedLots += 1;
		const month = l.receivedOn.slice(0, 7);
		let mo = row.months.find((x) => x.month === month);
		if (!mo) row.months.push((mo = { month, judged: 0, scrapped: 0, rate: null }));
		mo.judged += l.judged;
		mo.scrapped += l.scrapped;
		m.set(l.supplierId, row);
	}
	const suppliers = [...m.values()].map(({ lotCost, ...r }) => {
		const months = r.months.map((x) => ({ ...x, rate: x.judged ? x.scrapped / x.judged : null })).sort((a, b) => a.month.localeCompare(b.month));
		const judgedMonths = months.filter((x) => x.judged > 0);
		return {
			...r,
			months,
			scrap: rateCI(r.scrapped, r.judged),
			costPerGoodCents: r.accepted ? lotCost / r.accepted : null,
			trend: trendOf(r, judgedMonths[judgedMonths.length - 1])
		};
	});
	suppliers.sort((a, b) => a.supplier.localeCompare(b.supplier));
	return { filter, suppliers };
}
