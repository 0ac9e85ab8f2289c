/**
 * What kind of image a file is, told from its first bytes (its signature), never from its
 * name or the type the browser claims. Only the three kinds the shop keeps are recognised.
 *
 * Signatures: PNG — the 8-byte signature 89 50 4E 47 0D 0A 1A 0A (PNG specification,
 * ISO/IEC 15948, section 5.2); JPEG — the SOI marker FF D8 followed by a marker FF
 * (ITU-T T.81, annex B.1.1.3); WebP — a RIFF container whose form type is "WEBP" (RIFF
 * header "RIFF", 4 size bytes, "WEBP"; WebP container specification).
 */
export type ImageMime = 'image/jpeg' | 'image/png' | 'image/webp';

export const IMAGE_EXTENSION: Record<ImageMime, string> = {
	'image/jpeg': 'jpg',
	'image/png': 'png',
	'image/webp': 'webp'
};

export function sniffImage(bytes: Uint8Array): ImageMime | null {
	const b = bytes;
	if (b.length >= 8 && b[0] === 0x89 && b[1] === 0x50 && b[2] === 0x4e && b[3] === 0x47 && b[4] === 0x0d && b[5] === 0x0a && b[6] === 0x1a && b[7] === 0x0a) {
		return 'image/png';
	}
	if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return 'image/jpeg';
	const ascii = (from: number, to: number) => String.fromCharCode(...b.subarray(from, to));
	if (b.length >= 12 && ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP') return 'image/webp';
	return null;
}

/** Largest photo the shop keeps, in bytes. */
export const MAX_PHOTO_BYTES = 8 * 1024 * 1024;
/** Most photos in one qualification. */
export const MAX_PHOTOS = 12;

export type PhotoCheck = { ok: true; mime: ImageMime } | { ok: false; message: string };

/** Check one uploaded file: size first, then its bytes. `name` is only for the message. */
export function checkPhoto(name: string, bytes: Uint8Array, maxBytes = MAX_PHOTO_BYTES): PhotoCheck {
	const shown = name.slice(0, 80) || 'The photo';
	if (bytes.length === 0) return { ok: false, message: `${shown} is empty.` };
	if (bytes.length > maxBytes) {
		const mb = (n: number) => (n / (1024 * 1024)).toFixed(1);
		return { ok: false, message: `${shown} is ${mb(bytes.length)} MB; photos may be at most ${mb(maxBytes)} MB.` };
	}
	const mime = sniffImage(bytes);
	if (!mime) return { ok: false, message: `${shown} is not a JPEG, PNG or WebP image.` };
	return { ok: true, mime };
}

/** A content hash as the store names files: 64 lowercase hex digits. */
export function isSha256Hex(value: string): boolean {
	return /^[0-9a-f]{64}$/.test(value);
}
