/** A migrated in-memory database with a small shop in it, for integration tests. */
import { randomUUID } from 'node:crypto';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { coreLot, scrapReason, station, supplier, turboModel, user } from '../../src/lib/server/db/schema';
import { DEMO_SCRAP_REASONS, DEMO_STATIONS } from '../../src/lib/server/seed';
import { receiveUnits, type Actor } from '../../src/lib/server/units';
import { insertDemoSpec } from '../../src/lib/server/seed-balance';
import type { Role } from '../../src/lib/domain/auth/roles';

export interface TestShop {
	db: Db;
	actors: Record<Role, Actor>;
	lotId: number;
	modelId: number;
	receive(count?: number): string[];
}

export function testShop(url = ':memory:'): TestShop {
	const db = openDatabase(url);
	const actors = {} as Record<Role, Actor>;
	for (const role of ['owner', 'lead', 'tech', 'office'] as const) {
		const id = randomUUID();
		db.insert(user).values({ id, email: `${role}@shop.test`, name: `Test ${role}`, role, passwordHash: 'x' }).run();
		actors[role] = { id, role };
	}
	DEMO_STATIONS.forEach((s, i) => db.insert(station).values({ ...s, material: s.material ?? null, sortOrder: i }).run());
	for (const r of DEMO_SCRAP_REASONS) db.insert(scrapReason).values(r).run();
	const modelId = db.insert(turboModel).values({ code: 'CH-F46', family: 'F' }).returning().get().id;
	insertDemoSpec(db, modelId, 'CH-F46');
	const supplierId = db.insert(supplier).values({ name: 'Test Core Source' }).returning().get().id;
	const lotId = db
		.insert(coreLot)
		.values({ code: 'L-TEST-1', source: 'purchased_skid', supplierId, receivedOn: '2026-11-30', costPerCoreCents: 4000, expectedCount: 10 })
		.returning()
		.get().id;
	return {
		db,
		actors,
		lotId,
		modelId,
		receive: (count = 1) => receiveUnits(db, actors.office, lotId, Array.from({ length: count }, () => ({ modelId })))
	};
}
