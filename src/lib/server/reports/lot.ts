/** One lot in the scrap report: its row (with p-chart limits against every lot) and its units by state. */
import { eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db';
import { coreLot, turboModel, unit } from '../db/schema';
import { ALL_LOTS, scrapReport, type LotRow } from './scrap';

export interface LotReport {
	lot: LotRow;
	pBar: number | null;
	notes: string;
	byModel: { model: string; received: number; scrapped: number; waiting: number }[];
}

export function lotReport(db: DbOrTx, code: string): LotReport | null {
	const found = db.select({ id: coreLot.id, notes: coreLot.notes }).from(coreLot).where(eq(coreLot.code, code)).get();
	if (!found) return null;
	// limits against every lot; the reasons fetched for this one only
	const all = scrapReport(db, {}, { ...ALL_LOTS, lotId: found.id });
	const lot = all.lots.find((l) => l.id === found.id);
	if (!lot) return null;
	const byModel = db
		.select({
			model: turboModel.code,
			received: sql<number>`count(*)`,
			scrapped: sql<number>`sum(case when ${unit.state} = 'scrapped' then 1 else 0 end)`,
			waiting: sql<number>`sum(case when ${unit.state} in ('received', 'inspected') then 1 else 0 end)`
		})
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(unit.lotId, found.id))
		.groupBy(turboModel.code)
		.orderBy(turboModel.code)
		.all();
	return { lot, pBar: all.pBar, notes: found.notes, byModel };
}
