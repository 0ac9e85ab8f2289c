/**
 * Seed a shop-scale database for the benchmark: the demo shop's people and stations, then
 * many lots, units and events in bulk.  npx tsx bench/seed.ts [file] [lots] [units] [events]
 */
import { existsSync, rmSync } from 'node:fs';
import { openDatabase } from '../src/lib/server/db/index';
import { bulkLoad } from '../src/lib/server/db/bulk';
import { rng, seedDemo } from '../src/lib/server/seed';

export async function seedLarge(file: string, lots = 5000, units = 200_000, events = 2_000_000) {
	for (const f of [file, `${file}-wal`, `${file}-shm`]) if (existsSync(f)) rmSync(f);
	const db = openDatabase(file);
	await seedDemo(db, { lots: 0 });
	const started = performance.now();
	let last = 0;
	const made = bulkLoad(db, {
		lots,
		units,
		events,
		random: rng(7),
		onProgress: (done, total) => {
			const pct = Math.floor((done / total) * 100);
			if (pct >= last + 10 || done === total) {
				last = pct;
				process.stdout.write(`\r  seeding ${'#'.repeat(pct / 5).padEnd(20, '.')} ${done}/${total} lots`);
			}
		}
	});
	const ms = performance.now() - started;
	process.stdout.write('\n');
	db.$client.pragma('wal_checkpoint(TRUNCATE)');
	db.$client.close();
	return { ...made, ms };
}

if (import.meta.url === `file://${process.argv[1]}`) {
	const [file = 'bench/bench.db', lots, units, events] = process.argv.slice(2);
	const r = await seedLarge(file, Number(lots ?? 5000), Number(units ?? 200_000), Number(events ?? 2_000_000));
	console.log(`${r.lots} lots, ${r.units} units, ${r.events} events in ${(r.ms / 1000).toFixed(1)} s → ${file}`);
}
