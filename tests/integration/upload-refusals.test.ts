/**
 * Files are kept only when the move that references them commits. A teardown qualification
 * with photos that is refused — an unknown unit, a shipped one, a role that may not make the
 * move, a station that does not exist, a move refused after the photos were already written,
 * an error inside the transaction — leaves the uploads folder exactly as it was (every name
 * and size) and the database without a row of it.
 */
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { and, asc, eq } from 'drizzle-orm';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, test, vi } from 'vitest';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { checklist, checklistItem, coreLot, turboModel, unit, unitPhoto, user } from '../../src/lib/server/db/schema';
import { seedDemo } from '../../src/lib/server/seed';
import { applyMove, type Actor } from '../../src/lib/server/units';
import { MAX_PHOTO_BYTES, MAX_PHOTOS } from '../../src/lib/domain/photos/image-type';
import { INCOMING_PREFIX } from '../../src/lib/server/photos';
import { DEMO_PEOPLE } from '../helpers/server';

/** Run between writing the photos and the move's transaction (set per test). */
let betweenStageAndCommit: (() => void) | null = null;
vi.mock('../../src/lib/server/photos', async (importOriginal) => {
	const original = await importOriginal<typeof import('../../src/lib/server/photos')>();
	return {
		...original,
		stagePhotos: async (...args: Parameters<typeof original.stagePhotos>) => {
			const staged = await original.stagePhotos(...args);
			betweenStageAndCommit?.();
			return staged;
		}
	};
});

const dir = mkdtempSync(join(tmpdir(), 'spoolyard-upload-refusals-'));
const dbFile = join(dir, 'shop.db');
const uploads = join(dir, 'uploads');
process.env.DATABASE_URL = dbFile;
process.env.UPLOADS_DIR = uploads;

let db: Db;
let inspect: (typeof import('../../src/routes/api/units/[serial=serial]/inspection/+server'))['POST'];
const people = {} as Record<'tech' | 'lead' | 'office', Actor>;
let big: { name: string; bytes: Uint8Array }[];

beforeAll(async () => {
	db = openDatabase(dbFile);
	await seedDemo(db);
	for (const who of ['tech', 'lead', 'office'] as const) {
		const row = db.select().from(user).where(eq(user.email, DEMO_PEOPLE[who].email)).get()!;
		people[who] = { id: row.id, role: row.role };
	}
	inspect = (await import('../../src/routes/api/units/[serial=serial]/inspection/+server')).POST;
	// twelve different photos of just under 8 MB each: random pixels, stored without compression
	big = await photos(MAX_PHOTOS, 1600, 1700);
}, 120_000);
afterAll(() => {
	db?.$client.close();
	rmSync(dir, { recursive: true, force: true });
});

/** `count` different PNG photos of random pixels (so each has its own hash and file). */
async function photos(count: number, w = 320, h = 240): Promise<{ name: string; bytes: Uint8Array }[]> {
	return Promise.all(
		Array.from({ length: count }, async (_, i) => ({
			name: `teardown-${i + 1}.png`,
			bytes: new Uint8Array(await sharp(randomBytes(w * h * 3), { raw: { width: w, height: h, channels: 3 } }).png({ compressionLevel: 0 }).toBuffer())
		}))
	);
}

/** Every file under the uploads folder with its size: what "unchanged" is checked against. */
function folder(): string[] {
	return (readdirSync(uploads, { recursive: true }) as string[])
		.map((name) => `${name} ${statSync(join(uploads, name)).isDirectory() ? 'dir' : statSync(join(uploads, name)).size}`)
		.sort();
}

function rows() {
	const count = (table: string) => db.$client.prepare(`select count(*) from ${table}`).pluck().get() as number;
	return { events: count('unit_event'), inspections: count('inspection'), photos: count('unit_photo') };
}

let n = 0;
async function qualify(serial: string, who: keyof typeof people, fields: Record<string, string>, files: { name: string; bytes: Uint8Array }[], key = `refusal-key-${++n}`) {
	const fd = new FormData();
	for (const [k, v] of Object.entries({ stationCode: 'TEARDOWN-1', idempotencyKey: key, verdict: 'accept', ...fields })) fd.set(k, v);
	for (const f of files) fd.append('photos', new File([new Uint8Array(f.bytes)], f.name, { type: 'image/png' }));
	const request = new Request(`http://localhost/api/units/${serial}/inspection`, { method: 'POST', body: fd });
	const actor = people[who];
	// eslint-disable-next-line @typescript-eslint/no-explicit-any
	const res = await inspect({ params: { serial }, request, locals: { user: { ...actor, name: who, email: '', active: true }, session: null } } as any);
	return { status: res.status, body: await res.json() };
}

/** A unit waiting for its verdict at teardown, and every checklist item of its family answered "pass". */
function unitAtTeardown(): { serial: string; answers: Record<string, string> } {
	const row = db
		.select({ serial: unit.serial, family: turboModel.family })
		.from(unit)
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.where(and(eq(unit.state, 'received'), eq(unit.version, 1), eq(unit.held, false), eq(coreLot.source, 'purchased_skid')))
		.orderBy(asc(unit.id))
		.get()!;
	const moved = applyMove(db, people.tech, { serial: row.serial, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: `inspect-${row.serial}-${++n}` });
	expect(moved.ok).toBe(true);
	const list = db.select().from(checklist).where(eq(checklist.family, row.family)).get();
	const items = list ? db.select().from(checklistItem).where(eq(checklistItem.checklistId, list.id)).all() : [];
	const answers: Record<string, string> = {};
	for (const item of items) {
		answers[`result-${item.id}`] = 'pass';
		if (item.measureUnit) answers[`measure-${item.id}`] = '1';
	}
	return { serial: row.serial, answers };
}

function shippedSerial(): string {
	return db.select({ serial: unit.serial }).from(unit).where(eq(unit.state, 'shipped')).orderBy(asc(unit.id)).get()!.serial;
}

describe('a refused qualification leaves no file behind', () => {
	test(`${MAX_PHOTOS} photos of nearly ${MAX_PHOTO_BYTES / 1024 / 1024} MB to a shipped unit (409) and to an unknown serial (404)`, async () => {
		expect(big.every((f) => f.bytes.length > 7.5 * 1024 * 1024 && f.bytes.length <= MAX_PHOTO_BYTES)).toBe(true);
		const names = folder();
		const before = rows();
		const shipped = shippedSerial();
		const refused = await qualify(shipped, 'tech', {}, big);
		expect(refused.status).toBe(409);
		expect(refused.body.error.message).toMatch(new RegExp(shipped));
		expect(folder()).toEqual(names);
		const missing = await qualify('SY-99999', 'tech', {}, big);
		expect(missing).toMatchObject({ status: 404, body: { error: { message: 'No unit SY-99999 in the shop.' } } });
		expect(folder()).toEqual(names);
		expect(rows()).toEqual(before);
	}, 120_000);

	test('a role that may not make the verdict, and a station that does not exist', async () => {
		const { serial, answers } = unitAtTeardown();
		const names = folder();
		const before = rows();
		const office = await qualify(serial, 'office', answers, await photos(2));
		expect(office.status).toBe(403);
		expect(folder()).toEqual(names);
		const nowhere = await qualify(serial, 'tech', { ...answers, stationCode: 'NO-SUCH-BENCH' }, await photos(2));
		expect(nowhere).toMatchObject({ status: 400, body: { error: { message: 'No station NO-SUCH-BENCH.' } } });
		expect(folder()).toEqual(names);
		expect(rows()).toEqual(before);
	}, 60_000);

	test('a move refused after the photos were written (the unit moved meanwhile): the written files are removed', async () => {
		const { serial, answers } = unitAtTeardown();
		const names = folder();
		let staged: string[] = [];
		betweenStageAndCommit = () => {
			staged = readdirSync(uploads).filter((f) => f.startsWith(INCOMING_PREFIX));
			// the lead holds the unit while the tech's photos upload
			const held = applyMove(db, people.lead, { serial, action: 'hold', idempotencyKey: `hold-${serial}`, data: { reason: 'Customer called: wait' } });
			expect(held.ok).toBe(true);
		};
		try {
			const before = rows();
			const res = await qualify(serial, 'tech', answers, await photos(3));
			expect(res.status).toBe(409);
			expect(staged).toHaveLength(6); // three photos and their thumbnails were on disk under temporary names
			expect(folder()).toEqual(names);
			expect({ ...rows(), events: rows().events - 1 }).toEqual(before); // only the hold was recorded
		} finally {
			betweenStageAndCommit = null;
		}
	}, 60_000);

	test('an error inside the transaction: the request fails and the written files are removed', async () => {
		const { serial, answers } = unitAtTeardown();
		const names = folder();
		const before = rows();
		db.$client.exec(`create trigger test_inspection_fails before insert on inspection begin select raise(abort, 'the disk is on fire'); end`);
		try {
			await expect(qualify(serial, 'tech', answers, await photos(2))).rejects.toThrow(/disk is on fire/);
		} finally {
			db.$client.exec('drop trigger test_inspection_fails');
		}
		expect(folder()).toEqual(names);
		expect(rows()).toEqual(before);
	}, 60_000);

	test('the move that commits keeps its photos under their hash names, nothing temporary; the same request again changes nothing', async () => {
		const { serial, answers } = unitAtTeardown();
		const names = folder();
		const key = `kept-${serial}`;
		const ok = await qualify(serial, 'tech', answers, big.slice(0, 2), key);
		expect(ok).toMatchObject({ status: 201, body: { unit: { state: 'accepted' }, photos: 2 } });
		const after = folder();
		expect(after.length).toBeGreaterThan(names.length);
		expect(after.filter((f) => f.startsWith(INCOMING_PREFIX))).toEqual([]);
		const shas = db.select({ sha: unitPhoto.sha256 }).from(unitPhoto).innerJoin(unit, eq(unit.id, unitPhoto.unitId)).where(eq(unit.serial, serial)).all().map((r) => r.sha);
		expect(shas).toHaveLength(2);
		for (const sha of shas) {
			expect(statSync(join(uploads, sha.slice(0, 2), sha)).size).toBeGreaterThan(7.5 * 1024 * 1024);
			expect(statSync(join(uploads, sha.slice(0, 2), `${sha}.thumb.jpg`)).isFile()).toBe(true);
		}
		const again = await qualify(serial, 'tech', answers, big.slice(0, 2), key);
		expect(again).toMatchObject({ status: 200, body: { replayed: true } });
		expect(folder()).toEqual(after);
	}, 60_000);
});

test('after the demo seed and all of the above, every file in the uploads folder belongs to a photo row', () => {
	const shas = new Set(db.select({ sha: unitPhoto.sha256 }).from(unitPhoto).all().map((r) => r.sha));
	const files = (readdirSync(uploads, { recursive: true }) as string[]).filter((f) => !statSync(join(uploads, f)).isDirectory());
	expect(files.length).toBeGreaterThan(0);
	for (const f of files) expect(shas.has(f.slice(3).replace(/\.thumb\.jpg$/, '')), f).toBe(true);
});
