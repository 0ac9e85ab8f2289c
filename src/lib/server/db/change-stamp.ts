/**
 * A cheap stamp that changes whenever anything in the database may have changed: the rows this
 * process's connection has written since it opened (`total_changes()`), the commits of other
 * connections to the file (`PRAGMA data_version`) and a random id for the connection (a restart
 * starts the count again). Equal stamps mean nothing was written in between, so a read built from
 * the data may be answered "not modified". SQLite-specific; on PostgreSQL a sequence bumped by the
 * writes, or the current transaction id, would play the same part.
 */
import { randomBytes } from 'node:crypto';
import type { Db } from './index';

import type { Statement } from 'better-sqlite3';

const perConnection = new WeakMap<object, { id: string; changes: Statement }>();

export function changeStamp(db: Db): string {
	const client = db.$client;
	let c = perConnection.get(client);
	if (!c) perConnection.set(client, (c = { id: randomBytes(6).toString('base64url'), changes: client.prepare('select total_changes()').pluck() }));
	const id = c.id;
	const changes = c.changes.get() as number;
	const version = client.pragma('data_version', { simple: true }) as number;
	return `${id}.${changes}.${version}`;
}
