/**
 * Migrate the database and seed the demo shop if it is empty.
 *   tsx scripts/seed.ts [--fresh]   (--fresh deletes the database file first)
 */
import { existsSync, rmSync } from 'node:fs';
import { openDatabase } from '../src/lib/server/db/index';
import { DEMO_SHOP, isEmpty, seedDemo } from '../src/lib/server/seed';

const url = process.env.DATABASE_URL ?? 'data/spoolyard.db';
if (process.argv.includes('--fresh') && url !== ':memory:') {
	for (const f of [url, `${url}-wal`, `${url}-shm`]) if (existsSync(f)) rmSync(f);
}
const db = openDatabase(url);
if (isEmpty(db)) {
	const started = performance.now();
	const made = await seedDemo(db);
	console.log(
		`Seeded ${DEMO_SHOP}: ${made.users} people, ${made.lots} lots, ${made.units} units, ${made.events} events in ${Math.round(performance.now() - started)} ms → ${url}`
	);
} else {
	console.log(`${url} already has data; left as it is.`);
}
db.$client.close();
