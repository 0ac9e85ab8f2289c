/**
 * Photos the office shows a customer on the order's status page. Only photos of the order's
 * own unit can be shared; each decision is a new row in the append-only `unit_photo_share`
 * log and the latest row per photo holds. The customer's side sees the photo's id, size and
 * the caption the office wrote: never the file's name, who took it or any inspection note.
 */
import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import type { Db, DbOrTx } from './db';
import { rebuildOrder, unitPhoto, unitPhotoShare, user } from './db/schema';

export const CAPTION_MAX = 200;

export class PhotoShareError extends Error {}

export const shareFormSchema = z.object({
	photoId: z.coerce.number({ error: 'Choose a photo.' }).int('Choose a photo.').positive('Choose a photo.'),
	shared: z.enum(['true', 'false'], { error: 'Say whether to share the photo or stop sharing it.' }).transform((v) => v === 'true'),
	caption: z
		.string()
		.trim()
		.max(CAPTION_MAX, `Keep the caption to ${CAPTION_MAX} characters.`)
		.refine((v) => !/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.test(v), 'The caption has control characters; type it again.')
		.default('')
});
export type ShareInput = z.infer<typeof shareFormSchema>;

export interface OfficePhoto {
	id: number;
	sha256: string;
	originalName: string;
	at: string;
	shared: boolean;
	caption: string;
	/** Who made the latest sharing decision, and when; null before any. */
	decidedBy: string | null;
	decidedAt: string | null;
}

export interface CustomerPhoto {
	id: number;
	width: number | null;
	height: number | null;
	caption: string;
}

function unitOf(db: DbOrTx, orderId: number): number | null {
	return db.select({ unitId: rebuildOrder.unitId }).from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get()?.unitId ?? null;
}

/** The latest decision per photo of this order, keyed by photo id. */
function latestDecisions(db: DbOrTx, orderId: number, photoIds?: number[]) {
	const rows = db
		.select({ photoId: unitPhotoShare.photoId, shared: unitPhotoShare.shared, caption: unitPhotoShare.caption, at: unitPhotoShare.at, by: user.name })
		.from(unitPhotoShare)
		.innerJoin(user, eq(user.id, unitPhotoShare.userId))
		.where(photoIds ? and(eq(unitPhotoShare.orderId, orderId), inArray(unitPhotoShare.photoId, photoIds)) : eq(unitPhotoShare.orderId, orderId))
		.orderBy(desc(unitPhotoShare.id))
		.all();
	const latest = new Map<number, (typeof rows)[number]>();
	for (const r of rows) if (!latest.has(r.photoId)) latest.set(r.photoId, r);
	return latest;
}

/** Every photo of the order's unit, oldest first, with whether the customer sees it. */
export function orderPhotos(db: DbOrTx, orderId: number): OfficePhoto[] {
	const unitId = unitOf(db, orderId);
	if (unitId === null) return [];
	const photos = db
		.select({ id: unitPhoto.id, sha256: unitPhoto.sha256, originalName: unitPhoto.originalName, at: unitPhoto.at })
		.from(unitPhoto)
		.where(eq(unitPhoto.unitId, unitId))
		.orderBy(asc(unitPhoto.id))
		.all();
	const latest = latestDecisions(db, orderId);
	return photos.map((p) => {
		const d = latest.get(p.id);
		return {
			id: p.id,
			sha256: p.sha256,
			originalName: p.originalName,
			at: p.at.toISOString(),
			shared: d?.shared ?? false,
			caption: d?.caption ?? '',
			decidedBy: d?.by ?? null,
			decidedAt: d?.at.toISOString() ?? null
		};
	});
}

/**
 * Share a photo with the order's customer (with a caption), change its caption, or stop
 * sharing it. A request that changes nothing writes nothing. Returns whether a row was written.
 */
export function setPhotoShared(db: Db, orderId: number, input: ShareInput, userId: string, now: Date = new Date()): boolean {
	return db.transaction(
		(tx) => {
			const unitId = unitOf(tx, orderId);
			if (unitId === null) throw new PhotoShareError('No such rebuild order.');
			const photo = tx.select({ unitId: unitPhoto.unitId }).from(unitPhoto).where(eq(unitPhoto.id, input.photoId)).get();
			if (!photo || photo.unitId !== unitId) throw new PhotoShareError("That photo is not one of this order's unit.");
			const before = latestDecisions(tx, orderId, [input.photoId]).get(input.photoId);
			const caption = input.shared ? input.caption : (before?.caption ?? '');
			if ((before?.shared ?? false) === input.shared && (!input.shared || before?.caption === caption)) return false;
			tx.insert(unitPhotoShare).values({ photoId: input.photoId, orderId, shared: input.shared, caption, userId, at: now }).run();
			return true;
		},
		{ behavior: 'immediate' }
	);
}

/** What the customer sees: the shared photos of their order, oldest first. */
export function sharedPhotos(db: DbOrTx, orderId: number): CustomerPhoto[] {
	const unitId = unitOf(db, orderId);
	if (unitId === null) return [];
	const latest = latestDecisions(db, orderId);
	const ids = [...latest.values()].filter((d) => d.shared).map((d) => d.photoId);
	if (!ids.length) return [];
	return db
		.select({ id: unitPhoto.id, width: unitPhoto.width, height: unitPhoto.height })
		.from(unitPhoto)
		.where(and(eq(unitPhoto.unitId, unitId), inArray(unitPhoto.id, ids)))
		.orderBy(asc(unitPhoto.id))
		.all()
		.map((p) => ({ ...p, caption: latest.get(p.id)!.caption }));
}

/** The stored file of a photo the customer may see through this order, or null. */
export function sharedPhotoFile(db: DbOrTx, orderId: number, photoId: number): { sha256: string; mime: string } | null {
	if (!Number.isSafeInteger(photoId) || photoId <= 0) return null;
	const unitId = unitOf(db, orderId);
	if (unitId === null) return null;
	const d = latestDecisions(db, orderId, [photoId]).get(photoId);
	if (!d?.shared) return null;
	return db.select({ sha256: unitPhoto.sha256, mime: unitPhoto.mime }).from(unitPhoto).where(and(eq(unitPhoto.id, photoId), eq(unitPhoto.unitId, unitId))).get() ?? null;
}
