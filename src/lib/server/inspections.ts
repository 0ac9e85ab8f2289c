/**
 * Teardown qualification: the checklist for a unit's model family, recording answers and
 * photos together with the verdict move in one transaction, and reading them back.
 */
import { asc, desc, eq } from 'drizzle-orm';
import { checkQualification, type QualificationInput } from '../domain/inspection/qualification';
import type { Db, DbOrTx } from './db';
import { checklist, inspection, inspectionAnswer, unit, unitPhoto, user } from './db/schema';
import { checklistForSerial } from './checklists';
import type { StoredPhoto } from './photos';
import { applyMove, type Actor, type MoveResult } from './units';

export interface QualifyInput extends QualificationInput {
	serial: string;
	stationCode: string | null;
	idempotencyKey: string;
	photos: readonly StoredPhoto[];
}

/**
 * Record a qualification and make its verdict move (accept or scrap) in one immediate
 * transaction: the inspection, its answers and its photo rows are written inside the move's
 * transaction, so a refused move leaves none of them behind.
 *
 * With `dryRun`, everything is checked (the checklist answers, that the unit exists, the
 * station, the role, the route, the guards) and rolled back: what the move would answer now,
 * before any photo is written. A request key used before answers as the move would (the first
 * move again, or 422 for a different one).
 */
export function recordQualification(db: Db, actor: Actor, input: QualifyInput, now: Date = new Date(), options: { dryRun?: boolean } = {}): MoveResult {
	const list = checklistForSerial(db, input.serial);
	const checked = checkQualification(list?.items ?? [], input);
	if (!checked.ok) {
		const fields = Object.fromEntries(Object.entries(checked.fields).map(([k, v]) => [k, [v]]));
		return { ok: false, status: 400, code: 'invalid', message: checked.message, fields };
	}
	return applyMove(
		db,
		actor,
		{
			serial: input.serial,
			action: checked.verdict,
			stationCode: input.stationCode,
			idempotencyKey: input.idempotencyKey,
			note: checked.note,
			data: {
				...(checked.verdict === 'scrap' ? { reasonCode: checked.reasonCode } : {}),
				inspected: true,
				...(checked.labourMinutes !== null ? { labourMinutes: checked.labourMinutes } : {})
			}
		},
		now,
		{
			dryRun: options.dryRun,
			before: (tx, row, nextSeq, stationRow) => {
				const rec = tx
					.insert(inspection)
					.values({
						unitId: row.id,
						checklistId: list?.id ?? null,
						verdict: checked.verdict,
						reasonCode: checked.reasonCode,
						note: checked.note,
						userId: actor.id,
						stationId: stationRow?.id ?? null,
						eventSeq: nextSeq,
						at: now
					})
					.returning({ id: inspection.id })
					.get();
				for (const a of checked.answers) {
					tx.insert(inspectionAnswer)
						.values({ inspectionId: rec.id, itemId: a.itemId, label: a.label, result: a.result, measurement: a.measurement, measureUnit: a.measureUnit })
						.run();
				}
				for (const p of input.photos) {
					tx.insert(unitPhoto)
						.values({ unitId: row.id, inspectionId: rec.id, sha256: p.sha256, mime: p.mime, bytes: p.bytes, width: p.width, height: p.height, originalName: p.originalName, userId: actor.id, at: now })
						.run();
				}
			}
		}
	);
}

export interface InspectionView {
	id: number;
	verdict: 'accept' | 'scrap';
	reasonCode: string | null;
	note: string | null;
	at: string;
	eventSeq: number | null;
	by: string | null;
	checklist: string | null;
	answers: { label: string; result: 'pass' | 'fail' | 'na'; measurement: number | null; measureUnit: string | null }[];
	photos: PhotoView[];
}

export interface PhotoView {
	sha256: string;
	mime: string;
	originalName: string;
	width: number | null;
	height: number | null;
	at: string;
	inspectionId: number | null;
}

export function unitPhotos(db: DbOrTx, unitId: number): PhotoView[] {
	return db
		.select()
		.from(unitPhoto)
		.where(eq(unitPhoto.unitId, unitId))
		.orderBy(asc(unitPhoto.id))
		.all()
		.map((p) => ({ sha256: p.sha256, mime: p.mime, originalName: p.originalName, width: p.width, height: p.height, at: p.at.toISOString(), inspectionId: p.inspectionId }));
}

/** Every qualification of a unit, newest first, with answers and photos. */
export function unitInspections(db: DbOrTx, serial: string): InspectionView[] {
	const u = db.select({ id: unit.id }).from(unit).where(eq(unit.serial, serial)).get();
	if (!u) return [];
	const photos = unitPhotos(db, u.id);
	const rows = db
		.select({ i: inspection, by: user.name, list: checklist.name })
		.from(inspection)
		.leftJoin(user, eq(user.id, inspection.userId))
		.leftJoin(checklist, eq(checklist.id, inspection.checklistId))
		.where(eq(inspection.unitId, u.id))
		.orderBy(desc(inspection.at), desc(inspection.id))
		.all();
	return rows.map((r) => ({
		id: r.i.id,
		verdict: r.i.verdict,
		reasonCode: r.i.reasonCode,
		note: r.i.note,
		at: r.i.at.toISOString(),
		eventSeq: r.i.eventSeq,
		by: r.by,
		checklist: r.list,
		answers: db
			.select({ label: inspectionAnswer.label, result: inspectionAnswer.result, measurement: inspectionAnswer.measurement, measureUnit: inspectionAnswer.measureUnit })
			.from(inspectionAnswer)
			.where(eq(inspectionAnswer.inspectionId, r.i.id))
			.orderBy(asc(inspectionAnswer.id))
			.all(),
		photos: photos.filter((p) => p.inspectionId === r.i.id)
	}));
}

/** Whether a stored photo belongs to some unit (the photo route serves only those). */
export function photoMime(db: DbOrTx, sha256: string): string | null {
	return db.select({ mime: unitPhoto.mime }).from(unitPhoto).where(eq(unitPhoto.sha256, sha256)).get()?.mime ?? null;
}


/** What the unit page shows of the qualification: every record and every photo. */
export function unitInspectionData(db: DbOrTx, serial: string): { inspections: InspectionView[]; photos: PhotoView[] } {
	const u = db.select({ id: unit.id }).from(unit).where(eq(unit.serial, serial)).get();
	return u ? { inspections: unitInspections(db, serial), photos: unitPhotos(db, u.id) } : { inspections: [], photos: [] };
}
