/**
 * Photo storage: files live under the uploads folder (UPLOADS_DIR, default data/uploads),
 * named by the SHA-256 of their bytes, each with a JPEG thumbnail beside it. Nothing a client
 * sends ever becomes part of a path: files are found by a checked 64-hex-digit hash only.
 * Files are written before the rows that point at them, so a refused move leaves at most an
 * unreferenced file (the same bytes reuse it next time), never a row without its file.
 */
import { createHash, randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import sharp from 'sharp';
import { checkPhoto, isSha256Hex, MAX_PHOTO_BYTES, type ImageMime } from '../domain/photos/image-type';

export const THUMB_WIDTH = 320;

export function uploadsDir(): string {
	return resolve(process.env.UPLOADS_DIR ?? 'data/uploads');
}

function pathFor(sha256: string, variant: 'original' | 'thumb'): string {
	if (!isSha256Hex(sha256)) throw new Error('not a content hash');
	return join(uploadsDir(), sha256.slice(0, 2), variant === 'thumb' ? `${sha256}.thumb.jpg` : sha256);
}

function writeOnce(path: string, bytes: Uint8Array) {
	if (existsSync(path)) return;
	mkdirSync(resolve(path, '..'), { recursive: true });
	const tmp = `${path}.${randomUUID()}.tmp`;
	writeFileSync(tmp, bytes);
	renameSync(tmp, path);
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

export type StoreResult = { ok: true; photos: StoredPhoto[] } | { ok: false; message: string };

/** Check every file first (size, then bytes, then that it decodes), then write them all. */
export async function storePhotos(files: readonly PhotoUpload[], maxBytes = MAX_PHOTO_BYTES): Promise<StoreResult> {
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
	const photos: StoredPhoto[] = [];
	for (const c of checked) {
		const sha256 = createHash('sha256').update(c.file.bytes).digest('hex');
		writeOnce(pathFor(sha256, 'original'), c.file.bytes);
		writeOnce(pathFor(sha256, 'thumb'), c.thumb);
		photos.push({ sha256, mime: c.mime, bytes: c.file.bytes.length, width: c.width, height: c.height, originalName: c.file.name.slice(0, 200) });
	}
	return { ok: true, photos };
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
