/**
 * Put a backup back as the live database:
 *   npm run restore backups/spoolyard-2026-12-01T23-02-27Z.db
 * Stop the server first: the restore refuses while any process has the database open. The
 * backup is checked before anything is touched, the current database is kept beside it as
 * `<name>.before-restore-<time>`, and migrations newer than the backup are applied.
 */
import Database from 'better-sqlite3';
import { copyFileSync, existsSync, mkdirSync, renameSync, rmSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { openDatabase } from '../src/lib/server/db/index';
import { databasePath, processesHolding, stamp } from './db-files';

function fail(message: string): never {
	console.error(message);
	process.exit(1);
}

const args = process.argv.slice(2).filter((a) => !a.startsWith('--'));
if (args.length !== 1) fail('Usage: npm run restore FILE   (a backup made by npm run backup)');
const backup = resolve(args[0]);
const target = databasePath();
if (!existsSync(backup)) fail(`No such file: ${backup}`);
if (backup === target) fail('That is the live database itself.');

// 1. The backup must be a sound Spoolyard database.
try {
	const b = new Database(backup, { readonly: true, fileMustExist: true });
	try {
		const check = b.pragma('integrity_check', { simple: true });
		if (check !== 'ok') fail(`${backup} failed its integrity check: ${check}`);
		const tables = new Set(b.prepare(`select name from sqlite_master where type = 'table'`).pluck().all() as string[]);
		for (const t of ['unit', 'unit_event', 'user', '__drizzle_migrations']) {
			if (!tables.has(t)) fail(`${backup} is not a Spoolyard database (no ${t} table).`);
		}
		const fk = b.pragma('foreign_key_check') as unknown[];
		if (fk.length) fail(`${backup} has ${fk.length} broken references; not restoring it.`);
	} finally {
		b.close();
	}
} catch (e) {
	fail(`${backup} cannot be read as a database: ${(e as Error).message}`);
}

// 2. Nobody may have the live database open.
const holders = processesHolding(target);
if (holders === null && !process.argv.includes('--server-stopped')) {
	fail('Cannot see which processes have the database open here. Stop the server, then run again with --server-stopped.');
}
if (holders && holders.length) fail(`The database is in use by process ${holders.join(', ')}. Stop the server first, then restore.`);

// 3. Keep the current database (with its WAL folded in), then put the backup in its place.
let kept: string | null = null;
if (existsSync(target)) {
	const cur = new Database(target);
	cur.pragma('wal_checkpoint(TRUNCATE)');
	cur.close();
	kept = `${target}.before-restore-${stamp()}`;
	renameSync(target, kept);
}
for (const f of [`${target}-wal`, `${target}-shm`]) rmSync(f, { force: true });
mkdirSync(dirname(target), { recursive: true });
copyFileSync(backup, `${target}.restoring`);
renameSync(`${target}.restoring`, target);

// 4. Open it as the server would: WAL on, migrations newer than the backup applied.
const db = openDatabase(target);
const units = db.$client.prepare('select count(*) from unit').pluck().get();
const events = db.$client.prepare('select count(*) from unit_event').pluck().get();
db.$client.close();
console.log(`Restored ${backup} → ${target} (${units} units, ${events} events).${kept ? ` The previous database is kept as ${kept}.` : ''}`);
