/**
 * Statements built once per connection and reused. Building a Drizzle query and having SQLite
 * compile it costs more than running it on the hot paths (a scan is a dozen small queries), so
 * those queries are written with `sql.placeholder(...)`, prepared on first use and kept here,
 * keyed by the connection: a test's in-memory database gets its own set, and nothing outlives
 * the connection it was compiled for.
 *
 * A statement prepared on the connection runs inside a transaction of that same connection
 * (better-sqlite3 transactions are BEGIN … COMMIT on the one connection), so services may pass
 * either the connection or the transaction they are in.
 */
import type { DbOrTx } from './index';

const byConnection = new WeakMap<object, Map<string, unknown>>();

/** The better-sqlite3 connection behind a Drizzle database or transaction. */
function connectionOf(d: DbOrTx): object {
	const direct = (d as { $client?: object }).$client;
	if (direct) return direct;
	// A Drizzle transaction carries the connection's session, which holds the client.
	const viaSession = (d as unknown as { session?: { client?: object } }).session?.client;
	if (!viaSession) throw new Error('prepared(): cannot find the connection of this database handle');
	return viaSession;
}

/** The statement called `name` on this connection, built by `build` the first time. */
export function prepared<T>(d: DbOrTx, name: string, build: (d: DbOrTx) => T): T {
	const conn = connectionOf(d);
	let statements = byConnection.get(conn);
	if (!statements) byConnection.set(conn, (statements = new Map()));
	let s = statements.get(name) as T | undefined;
	if (s === undefined) {
		s = build(d);
		statements.set(name, s);
	}
	return s;
}
