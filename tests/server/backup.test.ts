/**
 * `npm run backup` under load and `npm run restore` into a fresh server: the copy is consistent
 * (every unit equals the fold of its history, every event is one the live database has), the
 * restore refuses a damaged file and a database a server holds, and the restored server serves
 * the same history.
 */
import { execFile } from 'node:child_process';
import { readdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { setTimeout as sleep } from 'node:timers/promises';
import { afterAll, beforeAll, expect, test } from 'vitest';
import Database from 'better-sqlite3';
import { openDatabase } from '../../src/lib/server/db/index';
import { getUnitWithHistory } from '../../src/lib/server/units';
import { checkUnits, prepareUnits } from '../helpers/shop-prep';
import { cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const run = promisify(execFile);
const ROOT = resolve(import.meta.dirname, '../..');
const PORT = 4266;
const RESTORED_PORT = 4267;
let server: RunningServer;
let restored: RunningServer | undefined;
let dir: string;
let file: string;
let serials: string[];

function script(name: string, args: string[], env: Record<string, string>) {
	return run('npx', ['tsx', `scripts/${name}.ts`, ...args], { cwd: ROOT, env: { ...process.env, ...env } }).then(
		(r) => ({ code: 0, out: r.stdout + r.stderr }),
		(e) => ({ code: e.code as number, out: String(e.stdout) + String(e.stderr) })
	);
}

beforeAll(async () => {
	await ensureBuilt();
	({ dir, file } = await freshDemoDb());
	serials = prepareUnits(file, 400);
	server = await startServer(file, PORT);
}, 300_000);

afterAll(async () => {
	await server?.stop();
	await restored?.stop();
	if (dir) cleanup(dir);
});

test('a backup taken under load is consistent, and restores into a server that serves the same history', async () => {
	const backups = join(dir, 'backups');
	const clients = [await signedIn(server.origin, 'tech'), await signedIn(server.origin, 'tech2')];
	let stop = false;
	let moves = 0;
	const load = clients.map(async (c, ci) => {
		for (const serial of serials.filter((_, i) => i % 2 === ci)) {
			for (const [action, stationCode] of [['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH']]) {
				if (stop) return;
				const r = await c.postJson(`/api/units/${serial}/events`, { action, stationCode, idempotencyKey: `bk-${serial}-${action}` }, { origin: c.origin });
				expect(r.status).toBe(201);
				moves++;
			}
		}
	});
	await sleep(500);
	const before = moves;
	const backup = await script('backup', ['--keep', '5'], { DATABASE_URL: file, BACKUP_DIR: backups });
	const during = moves - before;
	await sleep(300);
	stop = true;
	await Promise.all(load);
	for (const c of clients) c.close();
	expect(backup.code, backup.out).toBe(0);
	const made = readdirSync(backups);
	expect(made).toHaveLength(1);
	expect(made[0]).toMatch(/^shop-\d{4}-\d{2}-\d{2}T\d{2}-\d{2}-\d{2}Z\.db$/);
	const copyFile = join(backups, made[0]);
	expect(during, 'the clients kept scanning while the backup ran').toBeGreaterThan(0);

	// consistent: sound file, every unit equals its fold, every event is the live one
	const copy = openDatabase(copyFile, { migrate: false });
	const live = new Database(file, { readonly: true });
	let copyEvents = 0;
	try {
		expect(copy.$client.pragma('integrity_check', { simple: true })).toBe('ok');
		for (const u of checkUnits(copy)) expect(u.problem, u.serial).toBeNull();
		const liveEvent = live.prepare('select * from unit_event where id = ?');
		for (const e of copy.$client.prepare('select * from unit_event').iterate() as Iterable<{ id: number }>) {
			expect(liveEvent.get(e.id)).toEqual(e);
			copyEvents++;
		}
		const liveEvents = live.prepare('select count(*) from unit_event').pluck().get() as number;
		expect(copyEvents).toBeLessThanOrEqual(liveEvents);
		console.log(`backup: ${copyEvents} events copied while ${during} moves were made; live has ${liveEvents}`);
	} finally {
		copy.$client.close();
		live.close();
	}

	// the restore refuses a damaged file, and a database a running server holds
	const junk = join(dir, 'junk.db');
	writeFileSync(junk, 'SQLite format 3\u0000 but not really'.repeat(200));
	const bad = await script('restore', [junk], { DATABASE_URL: join(dir, 'fresh', 'shop.db') });
	expect(bad.code).not.toBe(0);
	expect(bad.out).toMatch(/cannot be read as a database|integrity/);
	const busy = await script('restore', [copyFile], { DATABASE_URL: file });
	expect(busy.code).not.toBe(0);
	expect(busy.out).toMatch(/in use by process \d+\. Stop the server first/);

	// restore into a fresh place and serve it
	const target = join(dir, 'fresh', 'shop.db');
	const restore = await script('restore', [copyFile], { DATABASE_URL: target });
	expect(restore.code, restore.out).toBe(0);
	restored = await startServer(target, RESTORED_PORT);
	const owner = await signedIn(restored.origin, 'owner');
	const expected = openDatabase(copyFile, { migrate: false });
	try {
		const touched = serials.filter((s) => {
			const u = getUnitWithHistory(expected, s);
			return u && u.history.length > 1;
		});
		expect(touched.length).toBeGreaterThan(0);
		const demo = expected.$client.prepare('select serial from unit where id % 20 = 0 limit 30').pluck().all() as string[];
		for (const serial of [...touched, ...demo]) {
			const r = await owner.get(`/api/units/${serial}`);
			expect(r.status).toBe(200);
			expect(r.json(), serial).toEqual(JSON.parse(JSON.stringify(getUnitWithHistory(expected, serial))));
		}
		const total = (await owner.get('/api/units?pageSize=1')).json().total;
		expect(total).toBe(expected.$client.prepare('select count(*) from unit').pluck().get());
	} finally {
		expected.$client.close();
		owner.close();
	}

	// once that server is stopped, restoring over it keeps the database it replaces
	await restored.stop();
	restored = undefined;
	const again = await script('restore', [copyFile], { DATABASE_URL: target });
	expect(again.code, again.out).toBe(0);
	expect(readdirSync(join(dir, 'fresh')).some((f) => /^shop\.db\.before-restore-.+Z$/.test(f))).toBe(true);
}, 300_000);
