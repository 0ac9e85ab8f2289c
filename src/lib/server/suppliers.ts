/** Suppliers of cores: the office and the owner keep the list. */
import { asc, eq, sql } from 'drizzle-orm';
import type { Role } from '../domain/auth/roles';
import { supplierSchema, type SupplierForm } from '../domain/lots/lot';
import type { Db, DbOrTx } from './db';
import { coreLot, supplier, unit } from './db/schema';

/** Who keeps the supplier list; everyone signed in may read it. */
export const SUPPLIER_EDITORS: readonly Role[] = ['owner', 'office'];

export interface SupplierView {
	id: number;
	name: string;
	notes: string;
	active: boolean;
	lots: number;
	units: number;
}

export function listSuppliers(db: DbOrTx, opts: { activeOnly?: boolean } = {}): SupplierView[] {
	const lots = db
		.select({ supplierId: coreLot.supplierId, lots: sql<number>`count(distinct ${coreLot.id})`.as('lots'), units: sql<number>`count(${unit.id})`.as('units') })
		.from(coreLot)
		.leftJoin(unit, eq(unit.lotId, coreLot.id))
		.groupBy(coreLot.supplierId)
		.as('lots');
	const rows = db
		.select({ s: supplier, lots: lots.lots, units: lots.units })
		.from(supplier)
		.leftJoin(lots, eq(lots.supplierId, supplier.id))
		.where(opts.activeOnly ? eq(supplier.active, true) : undefined)
		.orderBy(asc(supplier.name))
		.all();
	return rows.map((r) => ({ id: r.s.id, name: r.s.name, notes: r.s.notes, active: r.s.active, lots: r.lots ?? 0, units: r.units ?? 0 }));
}

export class DuplicateSupplierError extends Error {}

function nameTaken(tx: DbOrTx, name: string, exceptId?: number): boolean {
	const found = tx
		.select({ id: supplier.id })
		.from(supplier)
		.where(sql`lower(${supplier.name}) = lower(${name})`)
		.get();
	return !!found && found.id !== exceptId;
}

export function createSupplier(db: Db, input: SupplierForm): SupplierView {
	const data = supplierSchema.parse(input);
	return db.transaction(
		(tx) => {
			if (nameTaken(tx, data.name)) throw new DuplicateSupplierError(`${data.name} is already on the list.`);
			const r = tx.insert(supplier).values({ name: data.name, notes: data.notes }).returning().get();
			return { id: r.id, name: r.name, notes: r.notes, active: r.active, lots: 0, units: 0 };
		},
		{ behavior: 'immediate' }
	);
}

export function updateSupplier(db: Db, id: number, input: SupplierForm & { active: boolean }): boolean {
	const data = supplierSchema.parse(input);
	return db.transaction(
		(tx) => {
			if (nameTaken(tx, data.name, id)) throw new DuplicateSupplierError(`${data.name} is already on the list.`);
			return tx.update(supplier).set({ name: data.name, notes: data.notes, active: input.active }).where(eq(supplier.id, id)).run().changes === 1;
		},
		{ behavior: 'immediate' }
	);
}
