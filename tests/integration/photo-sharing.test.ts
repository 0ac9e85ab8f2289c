/**
 * Photos the office shares on a rebuild order: only that order's unit's photos, only while
 * shared, only through a live link of that order, and every decision kept.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { rebuildOrder, unitPhoto, unitPhotoShare } from '../../src/lib/server/db/schema';
import { PhotoShareError, orderPhotos, setPhotoShared, sharedPhotos, shareFormSchema } from '../../src/lib/server/photo-sharing';
import { storePhotos } from '../../src/lib/server/photos';
import { revokeOrderLinks, trackView } from '../../src/lib/server/rebuild-orders';
import { customerShop, newOrder } from '../helpers/customer';
import type { TestShop } from '../helpers/db';

// The route uses the application's connection and upload folder, both from the environment.
const dir = mkdtempSync(join(tmpdir(), 'spoolyard-share-'));
const dbFile = join(dir, 'share.db');
process.env.DATABASE_URL = dbFile;
process.env.UPLOADS_DIR = join(dir, 'uploads');
process.env.TRACK_RATE_LIMIT = '6'; // the photo bucket is four times the page's: 24 per address

let shop: TestShop;
let GET: (typeof import('../../src/routes/track/[token]/photos/[id=id]/+server'))['GET'];

beforeAll(async () => {
	shop = customerShop(dbFile);
	GET = (await import('../../src/routes/track/[token]/photos/[id=id]/+server')).GET;
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A teardown photo of the order's unit, stored the way the floor stores one. */
async function photoOf(orderId: number, name: string, colour: string): Promise<{ id: number; sha256: string; bytes: Buffer }> {
	const bytes = await sharp({ create: { width: 40, height: 30, channels: 3, background: colour } }).png().toBuffer();
	const stored = await storePhotos([{ name, bytes }]);
	if (!stored.ok) throw new Error(stored.message);
	const p = stored.photos[0];
	const unitId = shop.db.select({ unitId: rebuildOrder.unitId }).from(rebuildOrder).where(eq(rebuildOrder.id, orderId)).get()!.unitId;
	const row = shop.db
		.insert(unitPhoto)
		.values({ unitId, sha256: p.sha256, mime: p.mime, bytes: p.bytes, width: p.width, height: p.height, originalName: p.originalName, userId: shop.actors.tech.id, at: new Date() })
		.returning({ id: unitPhoto.id })
		.get();
	return { id: row.id, sha256: p.sha256, bytes };
}

let addr = 0;
/** Ask for a photo the way the framework does; returns the response or the error it threw. */
async function fetchPhoto(token: string, id: number, thumb = false, address = `10.1.0.${++addr}`) {
	try {
		const res = await GET({
			params: { token, id: String(id) },
			url: new URL(`http://localhost/track/${token}/photos/${id}${thumb ? '?size=thumb' : ''}`),
			getClientAddress: () => address
			// eslint-disable-next-line @typescript-eslint/no-explicit-any
		} as any);
		return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
	} catch (e) {
		const err = e as { status?: number; body?: unknown };
		return { status: err.status, body: err.body };
	}
}

const share = (orderId: number, photoId: number, shared: boolean, caption = '') => setPhotoShared(shop.db, orderId, { photoId, shared, caption }, shop.actors.office.id);
const NOT_VALID = { status: 404, body: { message: 'This link is not valid. Ask the shop to send you a new one.' } };

describe('sharing decisions', () => {
	test('nothing is shared until the office shares it; the caption goes with it; withdrawing hides it again', async () => {
		const a = newOrder(shop);
		const p1 = await photoOf(a.order.id, 'IMG_0001.png', '#884422');
		const p2 = await photoOf(a.order.id, 'IMG_0002.png', '#224488');
		expect(orderPhotos(shop.db, a.order.id).map((p) => [p.id, p.shared])).toEqual([[p1.id, false], [p2.id, false]]);
		expect(sharedPhotos(shop.db, a.order.id)).toEqual([]);

		expect(share(a.order.id, p2.id, true, 'Crack found in the turbine housing')).toBe(true);
		expect(sharedPhotos(shop.db, a.order.id)).toEqual([{ id: p2.id, width: 40, height: 30, caption: 'Crack found in the turbine housing' }]);
		// the same decision again writes nothing; a new caption is a new decision
		expect(share(a.order.id, p2.id, true, 'Crack found in the turbine housing')).toBe(false);
		expect(share(a.order.id, p2.id, true, 'Crack across the turbine housing')).toBe(true);
		expect(sharedPhotos(shop.db, a.order.id)[0].caption).toBe('Crack across the turbine housing');

		// the customer's page carries the id, size and caption only: no file name, no hash, no person
		const view = trackView(shop.db, a.order.id)!;
		expect(view.photos).toEqual([{ id: p2.id, width: 40, height: 30, caption: 'Crack across the turbine housing' }]);
		expect(JSON.stringify(view)).not.toMatch(/IMG_000|Test office|Test tech/);
		expect(JSON.stringify(view)).not.toContain(p2.sha256);

		expect(share(a.order.id, p2.id, false)).toBe(true);
		expect(sharedPhotos(shop.db, a.order.id)).toEqual([]);
		const log = shop.db.select().from(unitPhotoShare).where(eq(unitPhotoShare.orderId, a.order.id)).all();
		expect(log.map((r) => [r.photoId, r.shared, r.caption])).toEqual([
			[p2.id, true, 'Crack found in the turbine housing'],
			[p2.id, true, 'Crack across the turbine housing'],
			[p2.id, false, 'Crack across the turbine housing']
		]);
		expect(log.every((r) => r.userId === shop.actors.office.id)).toBe(true);
	});

	test("another order's photo cannot be shared, and a refusal writes nothing", async () => {
		const a = newOrder(shop);
		const b = newOrder(shop);
		const theirs = await photoOf(b.order.id, 'b.png', '#448822');
		const before = shop.db.select().from(unitPhotoShare).all().length;
		expect(() => share(a.order.id, theirs.id, true, 'not yours')).toThrow(PhotoShareError);
		expect(() => share(a.order.id, 999_999, true)).toThrow(/not one of this order/);
		expect(() => share(999_999, theirs.id, true)).toThrow(/No such rebuild order/);
		expect(shop.db.select().from(unitPhotoShare).all().length).toBe(before);
	});

	test('the form schema refuses bad ids, missing decisions, long or control-character captions with a sentence', () => {
		const bad = [
			{ photoId: 'x', shared: 'true' },
			{ photoId: '-3', shared: 'true' },
			{ photoId: '1.5', shared: 'true' },
			{ photoId: '4', shared: 'maybe' },
			{ photoId: '4' },
			{ photoId: '4', shared: 'true', caption: 'x'.repeat(201) },
			{ photoId: '4', shared: 'true', caption: 'bell\u0007' }
		];
		for (const b of bad) {
			const r = shareFormSchema.safeParse(b);
			expect(r.success, JSON.stringify(b)).toBe(false);
			expect(r.error!.issues[0].message).toMatch(/^[A-Z].*\.$/);
		}
		expect(shareFormSchema.parse({ photoId: '4', shared: 'true', caption: '  Seized shaft  ' })).toEqual({ photoId: 4, shared: true, caption: 'Seized shaft' });
	});

	test('the log is append-only in the database', async () => {
		const a = newOrder(shop);
		const p = await photoOf(a.order.id, 'x.png', '#111111');
		share(a.order.id, p.id, true, 'one');
		const c = shop.db.$client;
		const row = c.prepare(`select * from unit_photo_share order by id desc limit 1`).get() as Record<string, unknown>;
		for (const sql of [
			`update unit_photo_share set shared = 0 where id = ${row.id}`,
			`delete from unit_photo_share where id = ${row.id}`,
			`insert or replace into unit_photo_share (id, photo_id, order_id, shared, caption, user_id, at) values (${row.id}, ${row.photo_id}, ${row.order_id}, 0, '', '${row.user_id}', 0)`
		]) {
			expect(() => c.exec(sql), sql).toThrow(/append-only/);
		}
		expect(c.prepare(`select * from unit_photo_share where id = ?`).get(row.id)).toEqual(row);
	});
});

describe('the status link serves shared photos only', () => {
	test('a shared photo comes back with safe headers, as the original or the thumbnail', async () => {
		const a = newOrder(shop);
		const p = await photoOf(a.order.id, 'wheel.png', '#aa6633');
		share(a.order.id, p.id, true, 'Wheel rub marks');
		const full = await fetchPhoto(a.token, p.id);
		expect(full.status).toBe(200);
		expect(full.bytes!.equals(p.bytes)).toBe(true);
		expect(full.headers!.get('content-type')).toBe('image/png');
		expect(full.headers!.get('x-content-type-options')).toBe('nosniff');
		expect(full.headers!.get('content-security-policy')).toContain("default-src 'none'");
		expect(full.headers!.get('cache-control')).toMatch(/^private/);
		const thumb = await fetchPhoto(a.token, p.id, true);
		expect(thumb.status).toBe(200);
		expect(thumb.headers!.get('content-type')).toBe('image/jpeg');
		expect((await sharp(thumb.bytes!).metadata()).format).toBe('jpeg');
	});

	test('unshared, withdrawn, another order’s, unknown photos and bad, revoked tokens all get the same 404', async () => {
		const a = newOrder(shop);
		const b = newOrder(shop);
		const kept = await photoOf(a.order.id, 'kept.png', '#123456');
		const withdrawn = await photoOf(a.order.id, 'gone.png', '#654321');
		const theirs = await photoOf(b.order.id, 'theirs.png', '#abcdef');
		share(a.order.id, withdrawn.id, true, 'soon gone');
		share(a.order.id, withdrawn.id, false);
		share(b.order.id, theirs.id, true, 'b only');

		const answers = [
			await fetchPhoto(a.token, kept.id), // never shared
			await fetchPhoto(a.token, withdrawn.id), // shared, then withdrawn
			await fetchPhoto(a.token, theirs.id), // shared, but on another order
			await fetchPhoto(a.token, 999_999),
			await fetchPhoto('A'.repeat(43), theirs.id),
			await fetchPhoto(b.token.slice(0, -1) + (b.token.endsWith('A') ? 'B' : 'A'), theirs.id)
		];
		for (const r of answers) expect(r).toEqual(NOT_VALID);
		// b's own link does serve it, until the link is revoked
		expect((await fetchPhoto(b.token, theirs.id)).status).toBe(200);
		revokeOrderLinks(shop.db, b.order.id);
		expect(await fetchPhoto(b.token, theirs.id)).toEqual(NOT_VALID);
	});

	test('photo requests are rate-limited per address', async () => {
		const a = newOrder(shop);
		const p = await photoOf(a.order.id, 'r.png', '#777777');
		share(a.order.id, p.id, true);
		const statuses: (number | undefined)[] = [];
		for (let i = 0; i < 26; i++) statuses.push((await fetchPhoto(i % 2 ? a.token : 'C'.repeat(43), p.id, true, '198.51.100.9')).status);
		expect(statuses.slice(0, 24).filter((s) => s === 429)).toEqual([]);
		expect(statuses.slice(24)).toEqual([429, 429]);
		expect((await fetchPhoto(a.token, p.id, true, '198.51.100.10')).status).toBe(200);
	});
});
