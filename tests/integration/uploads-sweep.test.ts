/**
 * `npm run uploads:sweep`: lists files of the uploads folder that no photo row names and that
 * are older than a day, removes them only with --apply, and never touches a referenced file, a
 * young one (an upload may be on its way) or a file it does not recognise.
 */
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import sharp from 'sharp';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { unitPhoto } from '../../src/lib/server/db/schema';
import { testShop, type TestShop } from '../helpers/db';

const run = promisify(execFile);
const ROOT = resolve(import.meta.dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'spoolyard-sweep-'));
const dbFile = join(dir, 'shop.db');
const uploads = join(dir, 'uploads');
const DAY = 86_400_000;

let shop: TestShop;
const sha = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

/** Write a file and set its age. */
function put(name: string, bytes: Buffer | string, ageMs: number) {
	const path = join(uploads, name);
	mkdirSync(join(path, '..'), { recursive: true });
	writeFileSync(path, bytes);
	const t = new Date(Date.now() - ageMs);
	utimesSync(path, t, t);
}

function files(): string[] {
	return (readdirSync(uploads, { recursive: true }) as string[]).filter((f) => statSync(join(uploads, f)).isFile()).sort();
}

function sweep(...args: string[]) {
	return run(process.execPath, ['--import', 'tsx', 'scripts/uploads-sweep.ts', ...args], { cwd: ROOT, env: { ...process.env, DATABASE_URL: dbFile, UPLOADS_DIR: uploads } }).then(
		(r) => ({ code: 0, out: r.stdout + r.stderr }),
		(e) => ({ code: e.code as number, out: String(e.stdout) + String(e.stderr) })
	);
}

let kept: string;
let orphan: string;
let youngOrphan: string;

beforeAll(async () => {
	shop = testShop(dbFile);
	const [serial] = shop.receive();
	const unitId = (shop.db.$client.prepare('select id from unit where serial = ?').pluck().get(serial) as number)!;
	const png = (colour: string) => sharp({ create: { width: 4, height: 3, channels: 3, background: colour } }).png().toBuffer();
	const [a, b, c] = await Promise.all([png('#112233'), png('#445566'), png('#778899')]);
	kept = sha(a);
	orphan = sha(b);
	youngOrphan = sha(c);
	// a photo a row points at, two weeks old: kept whatever its age
	put(`${kept.slice(0, 2)}/${kept}`, a, 14 * DAY);
	put(`${kept.slice(0, 2)}/${kept}.thumb.jpg`, 'thumb', 14 * DAY);
	shop.db.insert(unitPhoto).values({ unitId, sha256: kept, mime: 'image/png', bytes: a.length, originalName: 'a.png', userId: shop.actors.tech.id, at: new Date() }).run();
	// a file of a move that never committed, two days old, with its thumbnail
	put(`${orphan.slice(0, 2)}/${orphan}`, b, 2 * DAY);
	put(`${orphan.slice(0, 2)}/${orphan}.thumb.jpg`, 'thumb', 2 * DAY);
	// an unreferenced file from an hour ago: its move may still be on its way
	put(`${youngOrphan.slice(0, 2)}/${youngOrphan}`, c, 3_600_000);
	// a temporary file left by a crash, and one still being written
	put('.incoming-3f1c9a5e-crashed', 'half a photo', 30 * 3_600_000);
	put('.incoming-77aa01b2-writing', 'half a photo', 60_000);
	// something the sweep does not know: listed, never removed
	put('notes.txt', 'kept by hand', 40 * DAY);
}, 60_000);

afterAll(() => {
	shop?.db.$client.close();
	rmSync(dir, { recursive: true, force: true });
});

test('a dry run lists what would go and removes nothing', async () => {
	const before = files();
	const r = await sweep();
	expect(r.code, r.out).toBe(0);
	expect(files()).toEqual(before);
	const listed = r.out.split('\n').filter((l) => l.startsWith('would remove ')).map((l) => l.split(/\s+/)[2]).sort();
	expect(listed).toEqual([`${orphan.slice(0, 2)}/${orphan}`, `${orphan.slice(0, 2)}/${orphan}.thumb.jpg`, '.incoming-3f1c9a5e-crashed'].sort());
	expect(r.out).toContain('unknown, left alone: notes.txt');
	expect(r.out).toContain('3 unreferenced files older than 24 h');
	expect(r.out).toContain('Dry run: nothing removed. Run with --apply to remove them.');
}, 120_000);

test('--apply removes exactly the old unreferenced files; referenced, young and unknown files stay', async () => {
	const r = await sweep('--apply');
	expect(r.code, r.out).toBe(0);
	expect(r.out).toContain('Removed 3');
	expect(files()).toEqual(
		[
			'.incoming-77aa01b2-writing',
			`${kept.slice(0, 2)}/${kept}`,
			`${kept.slice(0, 2)}/${kept}.thumb.jpg`,
			`${youngOrphan.slice(0, 2)}/${youngOrphan}`,
			'notes.txt'
		].sort()
	);
	expect(readdirSync(uploads).some((f) => f.startsWith('.sweeping-'))).toBe(false);
	// a second run finds nothing more to do
	const again = await sweep('--apply');
	expect(again.out).toContain('0 unreferenced files older than 24 h');
	// with a shorter age limit the hour-old orphan goes too, the referenced photo still stays
	const shorter = await sweep('--apply', '--older-than-hours', '1');
	expect(shorter.out).toContain('Removed 1');
	expect(existsSync(join(uploads, youngOrphan.slice(0, 2), youngOrphan))).toBe(false);
	expect(existsSync(join(uploads, kept.slice(0, 2), kept))).toBe(true);
}, 120_000);

test('a bad argument or a missing database is a sentence and removes nothing', async () => {
	const before = files();
	const bad = await sweep('--older-than-hours', 'soon');
	expect(bad.code).toBe(2);
	expect(bad.out).toContain('Usage: npm run uploads:sweep');
	const nodb = await run(process.execPath, ['--import', 'tsx', 'scripts/uploads-sweep.ts', '--apply'], {
		cwd: ROOT,
		env: { ...process.env, DATABASE_URL: join(dir, 'nowhere.db'), UPLOADS_DIR: uploads }
	}).catch((e) => ({ code: e.code as number, stdout: String(e.stdout), stderr: String(e.stderr) }));
	expect('code' in nodb ? nodb.code : 0).toBe(1);
	expect(nodb.stderr).toContain('No database at');
	expect(files()).toEqual(before);
}, 120_000);
