/**
 * Teardown checklists per model family: reading them, the owner's settings, and the fact the
 * accept guard needs (kept free of the move service so the fact loaders can import it).
 */
import { and, asc, desc, eq } from 'drizzle-orm';
import type { Db, DbOrTx } from './db';
import { checklist, checklistItem, inspection, turboModel, unit, type Unit } from './db/schema';
import type { FactLoader } from './unit-facts';

export interface ChecklistView {
	id: number;
	family: string;
	name: string;
	items: { id: number; label: string; measureUnit: string | null }[];
}

/** The active checklist for a model family, or null when the shop has none for it. */
export function checklistForFamily(db: DbOrTx, family: string): ChecklistView | null {
	const list = db.select().from(checklist).where(eq(checklist.family, family)).get();
	if (!list) return null;
	const items = db
		.select({ id: checklistItem.id, label: checklistItem.label, measureUnit: checklistItem.measureUnit })
		.from(checklistItem)
		.where(and(eq(checklistItem.checklistId, list.id), eq(checklistItem.active, true)))
		.orderBy(asc(checklistItem.sortOrder), asc(checklistItem.id))
		.all();
	return { id: list.id, family: list.family, name: list.name, items };
}

export function checklistForSerial(db: DbOrTx, serial: string): ChecklistView | null {
	const row = db.select({ family: turboModel.family }).from(unit).innerJoin(turboModel, eq(turboModel.id, unit.modelId)).where(eq(unit.serial, serial)).get();
	return row ? checklistForFamily(db, row.family) : null;
}

/** Guard facts for accept: is a checklist required, and was one completed for this very move. */
export const inspectionFacts: FactLoader = (tx, unitRow: Unit) => {
	const model = tx.select({ family: turboModel.family }).from(turboModel).where(eq(turboModel.id, unitRow.modelId)).get();
	const list = model ? checklistForFamily(tx, model.family) : null;
	const required = !!list && list.items.length > 0;
	const record = tx
		.select({ id: inspection.id })
		.from(inspection)
		.where(and(eq(inspection.unitId, unitRow.id), eq(inspection.eventSeq, unitRow.version + 1), eq(inspection.verdict, 'accept')))
		.get();
	return { inspectionRequired: required, hasInspectionRecord: !!record };
};

// --- the owner's checklist settings -----------------------------------------------------

export function listChecklists(db: DbOrTx) {
	const lists = db.select().from(checklist).orderBy(asc(checklist.family)).all();
	return lists.map((l) => ({
		id: l.id,
		family: l.family,
		name: l.name,
		items: db.select().from(checklistItem).where(eq(checklistItem.checklistId, l.id)).orderBy(asc(checklistItem.sortOrder), asc(checklistItem.id)).all()
	}));
}

export function createChecklist(db: Db, family: string, name: string): { ok: true; id: number } | { ok: false; message: string } {
	const fam = family.trim();
	if (!fam) return { ok: false, message: 'Choose a model family.' };
	if (db.select().from(checklist).where(eq(checklist.family, fam)).get()) return { ok: false, message: `Family ${fam} already has a checklist; add items to it.` };
	const id = db.insert(checklist).values({ family: fam, name: name.trim() || `Family ${fam} teardown` }).returning({ id: checklist.id }).get().id;
	return { ok: true, id };
}

export function addChecklistItem(db: Db, checklistId: number, label: string, measureUnit: string | null): { ok: true } | { ok: false; message: string } {
	const l = label.trim();
	if (l.length < 3 || l.length > 120) return { ok: false, message: 'Name the item in 3 to 120 characters.' };
	const unitText = measureUnit?.trim() || null;
	if (unitText && unitText.length > 12) return { ok: false, message: 'Keep the measurement unit to 12 characters (e.g. mm).' };
	const list = db.select().from(checklist).where(eq(checklist.id, checklistId)).get();
	if (!list) return { ok: false, message: 'No such checklist.' };
	const last = db.select({ s: checklistItem.sortOrder }).from(checklistItem).where(eq(checklistItem.checklistId, checklistId)).orderBy(desc(checklistItem.sortOrder)).get();
	db.insert(checklistItem).values({ checklistId, label: l, measureUnit: unitText, sortOrder: (last?.s ?? 0) + 1 }).run();
	return { ok: true };
}

export function setChecklistItemActive(db: Db, itemId: number, active: boolean): boolean {
	return db.update(checklistItem).set({ active }).where(eq(checklistItem.id, itemId)).run().changes === 1;
}
