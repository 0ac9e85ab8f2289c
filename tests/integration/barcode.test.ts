/**
 * The traveler's barcodes read back with an independent decoder: @zxing/library 0.21.3
 * (a port of the ZXing reader), fed the PNG our server route sends, decoded by pngjs.
 */
import zxing from '@zxing/library';
import { PNG } from 'pngjs';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { barcodePng, barcodeSvg } from '../../src/lib/server/barcode';
import { testShop } from '../helpers/db';

// The route handler uses the application's connection, opened from DATABASE_URL.
const dir = mkdtempSync(join(tmpdir(), 'spoolyard-barcode-'));
process.env.DATABASE_URL = join(dir, 'barcode.db');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const { BarcodeFormat, BinaryBitmap, DecodeHintType, HybridBinarizer, MultiFormatReader, RGBLuminanceSource } = zxing;

function decodePng(buf: Buffer): { text: string; format: number } {
	const png = PNG.sync.read(buf);
	const { width, height, data } = png;
	// Flatten RGBA onto white, then to 8-bit luminance (ITU-R BT.601 weights, as ZXing uses).
	const lum = new Uint8ClampedArray(width * height);
	for (let i = 0; i < width * height; i++) {
		const a = data[i * 4 + 3] / 255;
		const r = data[i * 4] * a + 255 * (1 - a);
		const g = data[i * 4 + 1] * a + 255 * (1 - a);
		const b = data[i * 4 + 2] * a + 255 * (1 - a);
		lum[i] = Math.round(0.299 * r + 0.587 * g + 0.114 * b);
	}
	const hints = new Map();
	hints.set(DecodeHintType.POSSIBLE_FORMATS, [BarcodeFormat.CODE_128, BarcodeFormat.DATA_MATRIX]);
	hints.set(DecodeHintType.TRY_HARDER, true);
	const reader = new MultiFormatReader();
	reader.setHints(hints);
	const bitmap = new BinaryBitmap(new HybridBinarizer(new RGBLuminanceSource(lum, width, height)));
	const result = reader.decode(bitmap, hints);
	return { text: result.getText(), format: result.getBarcodeFormat() };
}

describe('traveler barcodes decode to the serial', () => {
	for (const serial of ['SY-00001', 'SY-00421', 'SY-98765', 'SY-1234567']) {
		test(`Code 128 of ${serial}`, async () => {
			const got = decodePng(await barcodePng('code128', serial));
			expect(got.text).toBe(serial);
			expect(got.format).toBe(BarcodeFormat.CODE_128);
		});
		test(`DataMatrix of ${serial}`, async () => {
			const got = decodePng(await barcodePng('datamatrix', serial));
			expect(got.text).toBe(serial);
			expect(got.format).toBe(BarcodeFormat.DATA_MATRIX);
		});
	}

	test('a different serial does not read as this one (the decoder is really reading)', async () => {
		expect(decodePng(await barcodePng('code128', 'SY-00422')).text).not.toBe('SY-00421');
		expect(decodePng(await barcodePng('datamatrix', 'SY-00422')).text).not.toBe('SY-00421');
	});

	test('the SVG form is a standalone image on white', () => {
		const svg = barcodeSvg('code128', 'SY-00421');
		expect(svg.startsWith('<svg')).toBe(true);
		expect(svg).toContain('viewBox');
		expect(svg).toContain('#FFFFFF');
	});
});

describe('the barcode route', () => {
	test('sends a PNG that decodes to the serial, SVG by default, and refuses what it does not know', async () => {
		const shop = testShop(process.env.DATABASE_URL!);
		const [serial] = shop.receive(1);
		const { GET } = await import('../../src/routes/api/units/[serial=serial]/barcode/+server');
		// eslint-disable-next-line @typescript-eslint/no-explicit-any
		const call = (s: string, q: string) => GET({ params: { serial: s }, url: new URL(`http://localhost/api/units/${s}/barcode?${q}`) } as any);
		for (const symbology of ['code128', 'datamatrix']) {
			const res = await call(serial, `symbology=${symbology}&format=png`);
			expect(res.status).toBe(200);
			expect(res.headers.get('content-type')).toBe('image/png');
			expect(decodePng(Buffer.from(await res.arrayBuffer())).text).toBe(serial);
		}
		const svg = await call(serial, '');
		expect(svg.headers.get('content-type')).toBe('image/svg+xml');
		expect((await svg.text()).startsWith('<svg')).toBe(true);
		expect((await call('SY-99999', '')).status).toBe(404);
		expect((await call(serial, 'symbology=qr')).status).toBe(400);
		expect((await call(serial, 'format=gif')).status).toBe(400);
	});
});
