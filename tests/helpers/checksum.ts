/** A checksum of every row of every table, read through a separate read-only connection. */
import Database from 'better-sqlite3';
import { createHash } from 'node:crypto';

export function dbChecksum(file: string, exclude: readonly string[] = []): string {
	const db = new Database(file, { readonly: true, fileMustExist: true });
	try {
		const h = createHash('sha256');
		const tables = db
			.prepare(`select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name`)
			.pluck()
			.all() as string[];
		for (const t of tables) {
			if (exclude.includes(t)) continue;
			h.update(`\u0000table ${t}\u0000`);
			for (const row of db.prepare(`select * from "${t}" order by rowid`).raw().iterate()) h.update(JSON.stringify(row));
		}
		return h.digest('hex');
	} finally {
		db.close();
	}
}
