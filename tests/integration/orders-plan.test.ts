import { describe, expect, test } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { testShop } from '../helpers/db';
import { customerOrder, orderLine, turboModel, unit } from '../../src/lib/server/db/schema';
import { createOrder, importOrders, listOrders, previewOrderImport } from '../../src/lib/server/orders';
import { guessMapping } from '../../src/lib/domain/orders/order-csv';
import { buildPlan, setAlpha, suggestionToCard } from '../../src/lib/server/plan';
import { finishedStock, wipByModel } from '../../src/lib/server/stock';
import { cardUnits } from '../../src/lib/server/cards';
import { checkAccess } from '../../src/lib/server/access';

const count = (shop: ReturnType<typeof testShop>) => ({
	orders: shop.db.select({ n: sql<number>`count(*)` }).from(customerOrder).get()!.n,
	lines: shop.db.select({ n: sql<number>`count(*)` }).from(orderLine).get()!.n
});

describe('order CSV import', () => {
	const good = 'Order No,Depot,Part,Qty,Due\nCOD-1,Coast,CH-F46,3,2026-12-14\nCOD-1,Coast,CH-F46,1,2026-12-14\nWEB-9,web,ch-f46,2,\n';

	test('a file with bad rows imports nothing and lists every bad row with its reasons', () => {
		const shop = testShop();
		const text = good + 'NOD-2,North,CH-Z00,1,2026-12-14\nLAD-3,Lakes,CH-F46,-4,2026-12-14\n';
		const mapping = guessMapping(['Order No', 'Depot', 'Part', 'Qty', 'Due']);
		const preview = previewOrderImport(shop.db, text, null, guessMapping, new Date('2026-12-01T10:00:00Z'));
		expect(preview.mapping).toEqual(mapping);
		expect(preview.check?.orders.map((o) => o.ref)).toEqual(['COD-1', 'WEB-9']);
		expect(preview.check?.bad).toEqual([
			{ row: 5, ref: 'NOD-2', reasons: ['"CH-Z00" is not one of the shop\'s models.'] },
			{ row: 6, ref: 'LAD-3', reasons: ['"-4" is not a whole number of units above zero.'] }
		]);
		const r = importOrders(shop.db, shop.actors.office, text, mapping, new Date('2026-12-01T10:00:00Z'));
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(r.message).toBe('2 rows have problems; nothing was imported. Fix the file and try again.');
		expect(r.bad?.length).toBe(2);
		expect(count(shop)).toEqual({ orders: 0, lines: 0 });
	});

	test('a good file imports in one go; importing it again is refused for every row', () => {
		const shop = testShop();
		const mapping = guessMapping(['Order No', 'Depot', 'Part', 'Qty', 'Due']);
		const r = importOrders(shop.db, shop.actors.office, good, mapping, new Date('2026-12-01T10:00:00Z'));
		expect(r).toMatchObject({ ok: true, orders: 2, lines: 2 });
		const orders = listOrders(shop.db);
		expect(orders.map((o) => [o.ref, o.channel, o.units, o.orderedOn, o.dueOn])).toEqual([
			['COD-1', 'coast', 4, '2026-12-01', '2026-12-14'],
			['WEB-9', 'web', 2, '2026-12-01', null]
		]);
		const again = importOrders(shop.db, shop.actors.office, good, mapping);
		expect(again.ok).toBe(false);
		expect(count(shop)).toEqual({ orders: 2, lines: 2 });
	});

	test('a missing required column is named before any row is read', () => {
		const shop = testShop();
		const p = previewOrderImport(shop.db, 'ref,model\nA,CH-F46\n', null, guessMapping);
		expect(p.problems).toEqual(['Choose the column that holds the channel.', 'Choose the column that holds the quantity.']);
		expect(p.check).toBeNull();
	});

	test('a single order: a duplicate reference and an unknown model are refused', () => {
		const shop = testShop();
		expect(createOrder(shop.db, shop.actors.lead, { ref: 'WI-1', channel: 'walk_in', customer: 'Tessel Farm Co-op', lines: [{ model: 'CH-F46', quantity: 1 }] }).ok).toBe(true);
		expect(createOrder(shop.db, shop.actors.lead, { ref: 'WI-1', channel: 'walk_in', lines: [{ model: 'CH-F46', quantity: 1 }] })).toMatchObject({ ok: false, status: 409 });
		expect(createOrder(shop.db, shop.actors.lead, { ref: 'WI-2', channel: 'walk_in', lines: [{ model: 'CH-Q1', quantity: 1 }] })).toMatchObject({ ok: false, message: 'There is no model CH-Q1.' });
		expect(createOrder(shop.db, shop.actors.lead, { ref: 'WI-3', channel: 'walk_in', lines: [] })).toMatchObject({ ok: false, message: 'An order needs at least one line.' });
	});
});

describe('stock, WIP and the build plan', () => {
	test('the NIST series as order history gives its forecast; stock and WIP come off; a suggestion becomes a card', () => {
		const shop = testShop();
		const now = new Date('2026-12-02T09:00:00Z'); // a Wednesday; the past full weeks start 2026-09-07 … 2026-11-23
		// Source of the series: NIST/SEMATECH e-Handbook §6.4.3.1 (forecast ≈ 71.50, MSE ≈ 18.98 at α = 0.1).
		const series = [71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70];
		const weeks = buildPlan(shop.db, now).models[0].weeks;
		expect(weeks[0]).toBe('2026-09-07');
		series.forEach((q, i) => {
			const r = createOrder(shop.db, shop.actors.office, { ref: `H-${i}`, channel: 'north', orderedOn: weeks[i], lines: [{ model: 'CH-F46', quantity: q }] }, now);
			expect(r.ok).toBe(true);
			shop.db.update(customerOrder).set({ status: 'fulfilled' }).where(eq(customerOrder.ref, `H-${i}`)).run();
		});
		createOrder(shop.db, shop.actors.office, { ref: 'OPEN-1', channel: 'web', orderedOn: '2026-12-01', dueOn: '2026-12-04', lines: [{ model: 'CH-F46', quantity: 5 }] }, now);
		expect(setAlpha(shop.db, shop.actors.lead, 0.1).ok).toBe(false);
		expect(setAlpha(shop.db, shop.actors.owner, 0.1).ok).toBe(true);
		// 10 units: 4 packed, 4 machined (4/8 each = 2 equivalent), 2 received (feed cores)
		const serials = shop.receive(10);
		const set = (s: string[], state: 'packed' | 'machined') => s.forEach((x) => shop.db.update(unit).set({ state }).where(eq(unit.serial, x)).run());
		set(serials.slice(0, 4), 'packed');
		set(serials.slice(4, 8), 'machined');

		expect(finishedStock(shop.db)).toEqual([{ model: 'CH-F46', location: 'shop', locationLabel: 'Shop shelf, Pellmarsh', count: 4, held: 0 }]);
		const wip = wipByModel(shop.db);
		expect(wip).toHaveLength(2);
		expect(wip).toEqual(expect.arrayContaining([{ model: 'CH-F46', state: 'received', count: 2 }, { model: 'CH-F46', state: 'machined', count: 4 }]));

		const p = buildPlan(shop.db, now).models.find((m) => m.model === 'CH-F46')!;
		expect(p.history).toEqual(series);
		expect(p.forecast).toBeCloseTo(71.5, 2);
		expect(p.fit.mse).toBeCloseTo(18.98, 1);
		expect(p.openDue).toBe(5);
		expect(p.finished).toBe(4);
		expect(p.equivalentWip).toBe(2);
		expect(p.suggested).toBe(66); // ceil(71.50 − 4 − 2) = ceil(65.50)
		expect(p.feed).toEqual([{ lot: 'L-TEST-1', receivedOn: '2026-11-30', cores: 2 }]);

		const card = suggestionToCard(shop.db, shop.actors.lead, 'CH-F46', now);
		expect(card.ok).toBe(true);
		if (!card.ok) return;
		expect(card.card.title).toBe('Build 2 × CH-F46 this week');
		expect(card.card.style).toBe('restock');
		expect(card.card.dueOn).toBe('2026-12-06');
		expect(card.short).toBe(64);
		expect(cardUnits(shop.db, card.card.id).map((u) => u.serial).sort()).toEqual(serials.slice(8).sort());
		// the same cores are not put on a second card
		expect(suggestionToCard(shop.db, shop.actors.lead, 'CH-F46', now)).toMatchObject({ ok: false });
		expect(shop.db.select().from(turboModel).all().length).toBe(1);
	});

	test('who may do what on the new pages', () => {
		expect(checkAccess('/(app)/cards', 'GET', 'tech')).toBe('allow');
		expect(checkAccess('/(app)/cards', 'POST', 'tech')).toBe('forbidden');
		expect(checkAccess('/(app)/cards', 'POST', 'office')).toBe('forbidden');
		expect(checkAccess('/(app)/cards', 'POST', 'lead')).toBe('allow');
		expect(checkAccess('/api/cards/order', 'PUT', 'tech')).toBe('forbidden');
		expect(checkAccess('/api/cards/order', 'PUT', 'owner')).toBe('allow');
		expect(checkAccess('/(app)/demand', 'POST', 'office')).toBe('allow');
		expect(checkAccess('/(app)/demand/import', 'GET', 'tech')).toBe('forbidden');
		expect(checkAccess('/(app)/plan', 'GET', 'office')).toBe('forbidden');
	});
});
