/** What a traveler label shows, for one unit or a whole lot. */
import { asc, eq } from 'drizzle-orm';
import type { UnitState } from '../domain/units/states';
import type { DbOrTx } from './db';
import { coreLot, supplier, turboModel, unit, type LotSource } from './db/schema';

export interface TravelerView {
	serial: string;
	originalTag: string;
	model: string;
	family: string;
	lotCode: string;
	source: LotSource;
	supplier: string | null;
	receivedOn: string;
	state: UnitState;
}

function query(db: DbOrTx) {
	return db
		.select({
			serial: unit.serial,
			originalTag: unit.originalTag,
			model: turboModel.code,
			family: turboModel.family,
			lotCode: coreLot.code,
			source: coreLot.source,
			supplier: supplier.name,
			receivedOn: coreLot.receivedOn,
			state: unit.state
		})
		.from(unit)
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.leftJoin(supplier, eq(supplier.id, coreLot.supplierId));
}

export function travelerForUnit(db: DbOrTx, serial: string): TravelerView | null {
	return query(db).where(eq(unit.serial, serial)).get() ?? null;
}

export function travelersForLot(db: DbOrTx, lotCode: string): TravelerView[] {
	return query(db).where(eq(coreLot.code, lotCode)).orderBy(asc(unit.serial)).all();
}
