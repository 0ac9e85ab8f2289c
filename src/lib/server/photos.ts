/**
 * Photo storage: files live under the uploads folder (UPLOADS_DIR, default data/uploads),
 * named by the SHA-256 of their bytes, each with a JPEG thumbnail beside it. Nothing a client
 * sends ever becomes part of a path: files are found by a checked 64-hex-digit hash only.
 *
 * A file is kept only when the write that references it commits. `stagePhotos` checks every
 * file and writes it under a temporary name (`.incoming-<uuid>` in the uploads folder, on the
 * same file system so the move into place is a rename); after the transaction that inserts the
 * rows commits, `link()` renames the files to their hash names; on a refusal or an error
 * `discard()` removes them. A crash in between leaves only `.incoming-*` files, which
 * `npm run uploads:sweep` removes once they are a day old, with any file no row points at.
 */
import { createHash, randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import sharp from 'sharp';
import { checkPhoto, isSha256Hex, MAX_PHOTO_BYTES, type ImageMime } from '../domain/photos/image-type';
import { INCOMING_PREFIX, uploadsDir } from './upload-paths';

export { INCOMING_PREFIX, uploadsDir };

export const THUMB_WIDTH = 320;

function pathFor(sha256: string, variant: 'original' | 'thumb'): string {
	if (!isSha256Hex(sha256)) throw new Error('not a content hash');
	return join(uploadsDir(), sha256.slice(0, 2), variant === 'thumb' ? `${sha256}.thumb.jpg` : sha256);
}

export interface StoredPhoto {
	sha256: string;
	mime: ImageMime;
	bytes: number;
	width: number | null;
	height: number | null;
	originalName: string;
}

export type PhotoUpload = { name: string; bytes: Uint8Array };

/** Photos written under temporary names, waiting for the write that references them. */
export interface StagedPhotos {
	photos: StoredPhoto[];
	/**
	 * Move the files to their hash names: call right after the transaction that inserted their
	 * rows committed. A file already there (the same bytes, uploaded before) is replaced by the
	 * identical copy, which also renews its age for the sweep.
	 */
	link(): void;
	/** Remove whatever was not linked; safe to call more than once and after `link`. */
	discard(): void;
}

export type StageResult = { ok: true; staged: StagedPhotos } | { ok: false; message: string };
export type StoreResult = { ok: true; photos: StoredPhoto[] } | { ok: false; message: string };

/**
 * Check every file first (size, then bytes, then that it decodes), then write them all under
 * temporary names. Nothing is written when any file is refused.
 */
export async function stagePhotos(files: readonly PhotoUpload[], maxBytes = MAX_PHOTO_BYTES): Promise<StageResult> {
	const checked: { file: PhotoUpload; mime: ImageMime; width: number | null; height: number | null; thumb: Buffer }[] = [];
	for (const file of files) {
		const c = checkPhoto(file.name, file.bytes, maxBytes);
		if (!c.ok) return { ok: false, message: c.message };
		try {
			const image = sharp(file.bytes, { failOn: 'error' });
			const meta = await image.metadata();
			const thumb = await sharp(file.bytes).rotate().resize({ width: THUMB_WIDTH, withoutEnlargement: true }).flatten({ background: '#ffffff' }).jpeg({ quality: 78 }).toBuffer();
			checked.push({ file, mime: c.mime, width: meta.width ?? null, height: meta.height ?? null, thumb });
		} catch {
			return { ok: false, message: `${file.name.slice(0, 80) || 'The photo'} could not be read as an image; take it again or choose another file.` };
		}
	}
	const pending: { tmp: string; final: string }[] = [];
	const discard = () => {
		for (const p of pending.splice(0)) rmSync(p.tmp, { force: true });
	};
	const photos: StoredPhoto[] = [];
	try {
		if (checked.length) mkdirSync(uploadsDir(), { recursive: true });
		for (const c of checked) {
			const sha256 = createHash('sha256').update(c.file.bytes).digest('hex');
			for (const [variant, bytes] of [['original', c.file.bytes], ['thumb', c.thumb]] as const) {
				const tmp = join(uploadsDir(), `${INCOMING_PREFIX}${randomUUID()}`);
				pending.push({ tmp, final: pathFor(sha256, variant) });
				writeFileSync(tmp, bytes, { flag: 'wx' });
			}
			photos.push({ sha256, mime: c.mime, bytes: c.file.bytes.length, width: c.width, height: c.height, originalName: c.file.name.slice(0, 200) });
		}
	} catch (e) {
		discard(); // a full disk or a folder we may not write: nothing half-written stays
		throw e;
	}
	return {
		ok: true,
		staged: {
			photos,
			link() {
				while (pending.length) {
					const p = pending[0];
					mkdirSync(resolve(p.final, '..'), { recursive: true });
					renameSync(p.tmp, p.final);
					pending.shift();
				}
			},
			discard
		}
	};
}

/**
 * Run the synchronous write (one transaction) that references staged photos: when it returns
 * and `committed(result)` says its rows are in, link the files; in every other case — a
 * refusal, a replay, an exception — remove them.
 */
export function keepIfCommitted<T>(staged: StagedPhotos, write: () => T, committed: (result: T) => boolean = () => true): T {
	try {
		const result = write();
		if (committed(result)) staged.link();
		return result;
	} finally {
		staged.discard();
	}
}

/**
 * Check and store photos at once, for callers whose rows are already in or cannot be refused
 * (tests that insert the rows themselves). Request handlers stage, then `keepIfCommitted`.
 */
export async function storePhotos(files: readonly PhotoUpload[], maxBytes = MAX_PHOTO_BYTES): Promise<StoreResult> {
	const staged = await stagePhotos(files, maxBytes);
	if (!staged.ok) return staged;
	keepIfCommitted(staged.staged, () => null);
	return { ok: true, photos: staged.staged.photos };
}

/** The stored bytes of a photo or its thumbnail, or null. `sha256` must already be checked. */
export function readPhoto(sha256: string, variant: 'original' | 'thumb'): Buffer | null {
	if (!isSha256Hex(sha256)) return null;
	const path = pathFor(sha256, variant);
	return existsSync(path) ? readFileSync(path) : null;
}

/**
 * A stored photo as an HTTP answer: its own type, never sniffed, never run as a document.
 * `cacheControl` says how long a browser may keep it (staff: forever, by hash; customers:
 * briefly, because sharing can be withdrawn); `extra` adds headers.
 */
export function photoResponse(bytes: Buffer, contentType: string, cacheControl: string, extra: Record<string, string> = {}): Response {
	return new Response(new Uint8Array(bytes), {
		headers: {
			'content-type': contentType,
			'content-length': String(bytes.length),
			'x-content-type-options': 'nosniff',
			'content-security-policy': "default-src 'none'; sandbox",
			'cross-origin-resource-policy': 'same-origin',
			'content-disposition': 'inline',
			'cache-control': cacheControl,
			...extra
		}
	});
}
