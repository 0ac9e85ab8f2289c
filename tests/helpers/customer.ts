/** A test shop with what customer orders need: quote settings, depots, and a way to walk a unit. */
import { randomUUID } from 'node:crypto';
import { recordAssembly, recordBalanceRun } from '../../src/lib/server/balance';
import { GOOD_ASSEMBLY, GOOD_RUN } from './build-records';
import { shipLocation, rebuildSetting, scrapReason } from '../../src/lib/server/db/schema';
import { DEMO_DEPOTS } from '../../src/lib/server/seed-customer';
import { createRebuildOrder, type NewOrder } from '../../src/lib/server/rebuild-orders';
import { applyMove } from '../../src/lib/server/units';
import type { ActionName } from '../../src/lib/domain/units/actions';
import { testShop, type TestShop } from './db';

export function customerShop(url = ':memory:') {
	const shop = testShop(url);
	shop.db.insert(rebuildSetting).values([{ key: 'shopName', value: 'Test Turbo Shop' }, { key: 'taxRateBp', value: '825' }]).run();
	for (const d of DEMO_DEPOTS) shop.db.insert(shipLocation).values(d).run();
	shop.db.insert(scrapReason).values({ code: 'CUST-DECLINED', label: 'Customer declined', category: 'customer' }).run();
	return shop;
}

let n = 0;
export function orderInput(over: Partial<NewOrder> = {}): NewOrder {
	n += 1;
	return {
		customerName: `Test Customer ${n}`,
		email: `customer${n}@test.example`,
		phone: '',
		shipAddress: '1 Test Lane',
		modelCode: 'CH-F46',
		originalTag: `T-${n}`,
		complaint: 'Noisy.',
		promisedOn: '',
		notifyReceived: true,
		notifyQuote: true,
		notifyInWork: true,
		notifyShipped: true,
		...over
	};
}

export function newOrder(shop: TestShop, over: Partial<NewOrder> = {}, now = new Date()) {
	return createRebuildOrder(shop.db, shop.actors.office, orderInput(over), now);
}

/** Make moves as the lead (from anywhere); throws on a refusal. */
export function walk(shop: TestShop, serial: string, actions: ActionName[], data: Record<string, unknown> = {}) {
	for (const action of actions) {
		// The build records the assemble and balance moves need (their guards are tested in balance.test.ts).
		if (action === 'assemble' && !recordAssembly(shop.db, shop.actors.tech, serial, GOOD_ASSEMBLY).ok) throw new Error('assembly record refused');
		if (action === 'balance' && !recordBalanceRun(shop.db, shop.actors.tech, serial, GOOD_RUN).ok) throw new Error('balance run refused');
		const r = applyMove(shop.db, shop.actors.lead, { serial, action, idempotencyKey: randomUUID(), data });
		if (!r.ok) throw new Error(`${action}: ${r.message}`);
	}
}
