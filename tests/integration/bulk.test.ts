import { eq } from 'drizzle-orm';
import { expect, test } from 'vitest';
import { bulkLoad } from '../../src/lib/server/db/bulk';
import { openDatabase } from '../../src/lib/server/db/index';
import { unit, unitEvent } from '../../src/lib/server/db/schema';
import { replay } from '../../src/lib/domain/units/machine';
import { rng, seedDemo } from '../../src/lib/server/seed';

test('bulk-loaded histories replay to the stored state and hit the event target', async () => {
	const db = openDatabase(':memory:');
	await seedDemo(db, { lots: 0 });
	const made = bulkLoad(db, { lots: 20, units: 600, events: 6000, random: rng(3) });
	expect(made.units).toBe(600);
	expect(made.events).toBeGreaterThan(5400);
	expect(made.events).toBeLessThanOrEqual(6000);
	const units = db.select().from(unit).all();
	expect(units.some((u) => u.state === 'received')).toBe(true);
	expect(units.some((u) => u.state === 'shipped')).toBe(true);
	for (const u of units) {
		const history = db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).orderBy(unitEvent.seq).all();
		expect(replay(u.serial, history)).toEqual({ state: u.state, held: u.held, holdReason: null });
		expect(history.length).toBe(u.version);
	}
});
