/**
 * Opening the database: one better-sqlite3 connection per process, WAL journal, foreign
 * keys on, a busy timeout, and the migrations in `drizzle/` applied before first use.
 */
import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import * as schema from './schema';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

export interface OpenOptions {
	/** Folder holding the generated migrations; defaults to `drizzle/` under the working directory. */
	migrationsFolder?: string;
	/** Apply pending migrations (default true). */
	migrate?: boolean;
}

/** `:memory:` or a file path; a `file:` prefix is accepted. */
export function openDatabase(url: string, options: OpenOptions = {}): Db {
	const path = url.startsWith('file:') ? url.slice('file:'.length) : url;
	if (path !== ':memory:') mkdirSync(dirname(resolve(path)), { recursive: true });
	const client = new Database(path);
	client.pragma('journal_mode = WAL');
	// NORMAL in WAL mode: a committed transaction survives a process crash; on power loss
	// the last transactions before the loss may roll back, but the file stays consistent.
	client.pragma('synchronous = NORMAL');
	client.pragma('foreign_keys = ON');
	client.pragma('busy_timeout = 5000');
	const db = drizzle(client, { schema }) as Db;
	if (options.migrate !== false) {
		migrate(db, { migrationsFolder: options.migrationsFolder ?? resolve('drizzle') });
	}
	return db;
}

let shared: Db | undefined;

/** The application's connection, opened on first use from DATABASE_URL. */
export function getDb(): Db {
	shared ??= openDatabase(process.env.DATABASE_URL ?? 'data/spoolyard.db');
	return shared;
}

export { schema };

/** A transaction handle, as passed to `db.transaction((tx) => ...)`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** Either the connection or a transaction: read helpers take this. */
export type DbOrTx = Db | Tx;
