/**
 * A consistent copy of the live database, taken with SQLite's online backup while the server
 * keeps running, checked, and named with the time it was taken:
 *   npm run backup                      → backups/spoolyard-2026-12-01T23-02-27Z.db
 *   BACKUP_DIR=/mnt/nas npm run backup
 *   npm run backup -- --keep 30         (also delete all but the newest 30 backups)
 */
import Database from 'better-sqlite3';
import { mkdirSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import { databasePath, stamp } from './db-files';

const source = databasePath();
const dir = resolve(process.env.BACKUP_DIR ?? 'backups');
const keepAt = process.argv.indexOf('--keep');
const keep = keepAt > 0 ? Number(process.argv[keepAt + 1]) : null;
if (keep !== null && !(Number.isInteger(keep) && keep > 0)) {
	console.error('--keep needs a whole number of backups to keep, e.g. --keep 30');
	process.exit(2);
}
mkdirSync(dir, { recursive: true });

const name = `${basename(source).replace(/\.db$/, '')}-${stamp()}.db`;
const final = join(dir, name);
const partial = `${final}.partial`;
const started = performance.now();

const db = new Database(source, { fileMustExist: true });
db.pragma('busy_timeout = 5000');
try {
	// The online backup copies pages in steps and restarts if a writer changes the source
	// meanwhile, so the copy is one consistent snapshot even under load.
	await db.backup(partial);
} finally {
	db.close();
}

const copy = new Database(partial);
const check = copy.pragma('integrity_check', { simple: true });
const units = (copy.prepare('select count(*) from unit').pluck().get() as number) ?? 0;
const events = (copy.prepare('select count(*) from unit_event').pluck().get() as number) ?? 0;
copy.pragma('journal_mode = DELETE'); // a single self-contained file
copy.close();
if (check !== 'ok') {
	rmSync(partial, { force: true });
	console.error(`The copy failed its integrity check (${check}); nothing was kept.`);
	process.exit(1);
}
renameSync(partial, final);
console.log(`Backed up ${source} → ${final} (${units} units, ${events} events, ${(statSync(final).size / 1e6).toFixed(1)} MB, ${Math.round(performance.now() - started)} ms)`);

if (keep !== null) {
	const prefix = `${basename(source).replace(/\.db$/, '')}-`;
	const old = readdirSync(dir)
		.filter((f) => f.startsWith(prefix) && f.endsWith('.db'))
		.sort()
		.slice(0, -keep);
	for (const f of old) rmSync(join(dir, f));
	if (old.length) console.log(`Removed ${old.length} older backup(s), kept the newest ${keep}.`);
}
