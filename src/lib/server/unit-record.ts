/** Everything the printed history of one unit shows: the unit, its lot and supplier, its model and every event. */
import { eq } from 'drizzle-orm';
import type { DbOrTx } from './db';
import { coreLot, supplier, turboModel, unit } from './db/schema';
import { getUnitWithHistory, type EventView, type UnitView } from './units';

export interface UnitRecord {
	unit: UnitView;
	history: EventView[];
	notes: string;
	lot: { code: string; source: string; supplier: string | null; supplierNotes: string | null; receivedOn: string; notes: string };
	model: { code: string; family: string; description: string };
}

export function unitRecord(db: DbOrTx, serial: string): UnitRecord | null {
	const found = getUnitWithHistory(db, serial);
	if (!found) return null;
	const row = db
		.select({
			notes: unit.notes,
			lotCode: coreLot.code,
			source: coreLot.source,
			receivedOn: coreLot.receivedOn,
			lotNotes: coreLot.notes,
			supplier: supplier.name,
			supplierNotes: supplier.notes,
			modelCode: turboModel.code,
			family: turboModel.family,
			description: turboModel.description
		})
		.from(unit)
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.leftJoin(supplier, eq(supplier.id, coreLot.supplierId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(eq(unit.serial, serial))
		.get()!;
	return {
		...found,
		notes: row.notes,
		lot: { code: row.lotCode, source: row.source, supplier: row.supplier, supplierNotes: row.supplierNotes, receivedOn: row.receivedOn, notes: row.lotNotes },
		model: { code: row.modelCode, family: row.family, description: row.description }
	};
}
