import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { cardOf, cardTakes, compareQueueEntries, orderQueue, type CardForOrder, type UnitForOrder } from '../../src/lib/domain/queue-order';

const card = (over: Partial<CardForOrder> & { id: number; rank: number }): CardForOrder => ({
	dueOn: null,
	open: true,
	kind: 'rule',
	ruleModelId: null,
	ruleStage: null,
	ruleLotId: null,
	...over
});
const u = (id: number, over: Partial<UnitForOrder> = {}): UnitForOrder => ({ id, modelId: 1, lotId: 1, setCardId: null, since: id * 1000, ...over });

describe('which card a unit is on', () => {
	test('a rule matches when every set part matches', () => {
		const c = card({ id: 1, rank: 1, ruleModelId: 2, ruleStage: 'machine' });
		expect(cardTakes(c, u(1, { modelId: 2 }), 'machine')).toBe(true);
		expect(cardTakes(c, u(1, { modelId: 2 }), 'paint')).toBe(false);
		expect(cardTakes(c, u(1, { modelId: 3 }), 'machine')).toBe(false);
		expect(cardTakes(card({ id: 2, rank: 1, ruleLotId: 7 }), u(1, { lotId: 7 }), null)).toBe(true);
	});

	test('an empty rule takes nothing; a closed card takes nothing', () => {
		expect(cardTakes(card({ id: 1, rank: 1 }), u(1), 'paint')).toBe(false);
		expect(cardTakes(card({ id: 1, rank: 1, ruleModelId: 1, open: false }), u(1), 'paint')).toBe(false);
	});

	test('a units card takes only its own units', () => {
		const c = card({ id: 4, rank: 1, kind: 'units' });
		expect(cardTakes(c, u(1, { setCardId: 4 }), 'paint')).toBe(true);
		expect(cardTakes(c, u(1, { setCardId: 5 }), 'paint')).toBe(false);
	});

	test('of several cards that take a unit, the best ranked wins', () => {
		const cards = [card({ id: 1, rank: 3, ruleModelId: 1 }), card({ id: 2, rank: 2, kind: 'units' }), card({ id: 3, rank: 5, ruleLotId: 1 })];
		expect(cardOf(cards, u(1, { setCardId: 2 }), 'paint')?.id).toBe(2);
		expect(cardOf(cards, u(1), 'paint')?.id).toBe(1);
		expect(cardOf(cards, u(1, { modelId: 9, lotId: 9 }), 'paint')).toBeNull();
	});
});

describe('queue order: card rank, then due date, then age; no card last', () => {
	test('a worked example', () => {
		const cards = [
			card({ id: 10, rank: 2, ruleModelId: 2, dueOn: '2026-12-10' }),
			card({ id: 11, rank: 1, kind: 'units' }),
			card({ id: 12, rank: 3, ruleLotId: 5 })
		];
		const units = [
			u(1, { since: 100 }), // no card, oldest of all
			u(2, { modelId: 2, since: 500 }), // card 10
			u(3, { setCardId: 11, since: 900 }), // card 11 (rank 1), youngest
			u(4, { modelId: 2, since: 300 }), // card 10, older than 2
			u(5, { lotId: 5, since: 50 }), // card 12
			u(6, { since: 200 }) // no card
		];
		expect(orderQueue(cards, units, 'paint').map((e) => e.unit.id)).toEqual([3, 4, 2, 5, 1, 6]);
	});

	test('equal ranks fall back to the earlier due date, a missing due date last', () => {
		const a = { card: { id: 1, rank: 1, dueOn: null }, unit: { id: 1, since: 0 } };
		const b = { card: { id: 2, rank: 1, dueOn: '2026-12-20' }, unit: { id: 2, since: 9 } };
		const c = { card: { id: 3, rank: 1, dueOn: '2026-12-05' }, unit: { id: 3, since: 9 } };
		expect([a, b, c].sort(compareQueueEntries).map((e) => e.card.id)).toEqual([3, 2, 1]);
	});

	test('properties: carded before uncarded; within a card, oldest first; the order is total', () => {
		fc.assert(
			fc.property(
				fc.array(fc.record({ rank: fc.integer({ min: 1, max: 6 }), model: fc.option(fc.integer({ min: 1, max: 3 })), kind: fc.constantFrom('units', 'rule') }), { maxLength: 5 }),
				fc.array(fc.record({ model: fc.integer({ min: 1, max: 3 }), set: fc.option(fc.integer({ min: 0, max: 4 })), since: fc.integer({ min: 0, max: 50 }) }), { maxLength: 30 }),
				(cs, us) => {
					const cards = cs.map((c, i) => card({ id: i, rank: c.rank, kind: c.kind as 'units' | 'rule', ruleModelId: c.model }));
					const units = us.map((x, i) => u(i + 1, { modelId: x.model, setCardId: x.set, since: x.since }));
					const q = orderQueue(cards, units, 'paint');
					// every unit on a card comes before every unit without one
					expect(q.map((e) => (e.card ? 'c' : 'u')).join('')).toMatch(/^c*u*$/);
					for (let i = 1; i < q.length; i++) {
						expect(compareQueueEntries(q[i - 1], q[i])).toBeLessThan(0);
						// on the same card (or both on none), the older unit first
						expect(q[i - 1].card?.id === q[i].card?.id && q[i - 1].unit.since > q[i].unit.since).toBe(false);
					}
				}
			)
		);
	});
});
