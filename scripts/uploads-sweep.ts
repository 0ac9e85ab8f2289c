/**
 * Files in the uploads folder that no row points at, older than a day: listed, and removed only
 * with --apply.
 *   npm run uploads:sweep                        → dry run: what would go, and how much
 *   npm run uploads:sweep -- --apply             → remove them
 *   npm run uploads:sweep -- --older-than-hours 48
 * Uses the app's settings: DATABASE_URL (default data/spoolyard.db) and UPLOADS_DIR (default
 * data/uploads). Safe while the server runs: a file is first renamed aside, then checked
 * against the database once more, and put back if a move referenced it meanwhile.
 *
 * What counts: `XX/<sha256>` and `XX/<sha256>.thumb.jpg` whose hash no `unit_photo` row names,
 * and `.incoming-*` files (uploads whose move never committed, left by a crash). Any other
 * file is listed as unknown and never touched.
 */
import Database from 'better-sqlite3';
import { existsSync, lstatSync, readdirSync, renameSync, rmSync, type Stats } from 'node:fs';
import { join, relative } from 'node:path';
import { databasePath } from './db-files';
import { INCOMING_PREFIX, uploadsDir } from '../src/lib/server/upload-paths';

const SHA = /^[0-9a-f]{64}$/;
const args = process.argv.slice(2);
const apply = args.includes('--apply');
const hoursAt = args.indexOf('--older-than-hours');
const hours = hoursAt >= 0 ? Number(args[hoursAt + 1]) : 24;
const unknownArg = args.find((a, i) => a !== '--apply' && a !== '--older-than-hours' && !(hoursAt >= 0 && i === hoursAt + 1));
if (unknownArg !== undefined || !(Number.isFinite(hours) && hours >= 1)) {
	console.error('Usage: npm run uploads:sweep [-- --apply] [--older-than-hours N]  (N a number of hours, at least 1; default 24)');
	process.exit(2);
}

const root = uploadsDir();
if (!existsSync(root)) {
	console.log(`No uploads folder at ${root}; nothing to sweep.`);
	process.exit(0);
}
const dbFile = databasePath();
if (!existsSync(dbFile)) {
	console.error(`No database at ${dbFile}; set DATABASE_URL to the shop's database. Nothing was removed.`);
	process.exit(1);
}
const db = new Database(dbFile, { readonly: true, fileMustExist: true });
db.pragma('busy_timeout = 5000');
const referencedStmt = db.prepare('select 1 from unit_photo where sha256 = ? limit 1').pluck();
const isReferenced = (sha: string) => referencedStmt.get(sha) !== undefined;

interface Candidate {
	path: string;
	/** The hash the file belongs to, or null for a temporary file of an upload that never committed. */
	sha: string | null;
	stats: Stats;
}

const cutoff = Date.now() - hours * 3_600_000;
const candidates: Candidate[] = [];
const unknown: string[] = [];
let young = 0;
let kept = 0;

function consider(path: string, sha: string | null) {
	const stats = lstatSync(path);
	if (!stats.isFile()) {
		unknown.push(path);
		return;
	}
	if (sha !== null && isReferenced(sha)) {
		kept++;
		return;
	}
	if (stats.mtimeMs > cutoff) {
		young++;
		return;
	}
	candidates.push({ path, sha, stats });
}

for (const entry of readdirSync(root, { withFileTypes: true })) {
	const path = join(root, entry.name);
	if (entry.isFile() && entry.name.startsWith(INCOMING_PREFIX)) consider(path, null);
	else if (entry.isDirectory() && /^[0-9a-f]{2}$/.test(entry.name)) {
		for (const inner of readdirSync(path, { withFileTypes: true })) {
			const full = join(path, inner.name);
			const sha = inner.name.replace(/\.thumb\.jpg$/, '');
			if (SHA.test(sha) && sha.startsWith(entry.name)) consider(full, sha);
			else unknown.push(full);
		}
	} else unknown.push(path);
}

const mb = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(1)} MB`;
const total = candidates.reduce((sum, c) => sum + c.stats.size, 0);
let removed = 0;
let removedBytes = 0;
let putBack = 0;

for (const c of candidates) {
	const name = relative(root, c.path);
	const age = `${((Date.now() - c.stats.mtimeMs) / 3_600_000).toFixed(0)} h old`;
	if (!apply) {
		console.log(`would remove ${name}  (${c.stats.size} bytes, ${age})`);
		continue;
	}
	// Aside first, then ask the database again: a move that committed meanwhile (and renamed a
	// fresh copy into place) wins, and its file is put back.
	const aside = join(root, `.sweeping-${process.pid}-${removed + putBack}`);
	try {
		renameSync(c.path, aside);
	} catch {
		continue; // gone or replaced meanwhile
	}
	if (c.sha !== null && isReferenced(c.sha)) {
		if (existsSync(c.path)) rmSync(aside, { force: true });
		else renameSync(aside, c.path);
		putBack++;
		continue;
	}
	rmSync(aside, { force: true });
	removed++;
	removedBytes += c.stats.size;
	console.log(`removed ${name}  (${c.stats.size} bytes, ${age})`);
}
db.close();

for (const path of unknown) console.log(`unknown, left alone: ${relative(root, path)}`);
const summary = `${candidates.length} unreferenced file${candidates.length === 1 ? '' : 's'} older than ${hours} h (${mb(total)}); ${kept} referenced; ${young} unreferenced but younger, left for now.`;
if (apply) console.log(`${summary} Removed ${removed} (${mb(removedBytes)})${putBack ? `; ${putBack} put back because a move now references them` : ''}.`);
else console.log(`${summary} Dry run: nothing removed. Run with --apply to remove them.`);
