/**
 * Make one move from a separate process, starting at a given instant, and print the result.
 * Used to race two writers on one database file.
 *   tsx tests/helpers/move-once.ts DB SERIAL STATION USER_ID ROLE ACTION KEY START_AT_MS
 */
import { openDatabase } from '../../src/lib/server/db/index';
import { applyMove } from '../../src/lib/server/units';
import type { Role } from '../../src/lib/domain/auth/roles';
import type { ActionName } from '../../src/lib/domain/units/actions';

const [db, serial, stationCode, userId, role, action, key, startAt] = process.argv.slice(2);
const conn = openDatabase(db, { migrate: false });
while (Date.now() < Number(startAt)) {
	/* wait for the common start so both processes race */
}
const result = applyMove(conn, { id: userId, role: role as Role }, { serial, action: action as ActionName, stationCode, idempotencyKey: key });
process.stdout.write(JSON.stringify({ ok: result.ok, status: result.status }));
conn.$client.close();
