import { describe, expect, test } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { testShop } from '../helpers/db';
import { coreLot, priorityCard, priorityCardChange, priorityCardUnit, turboModel, unit } from '../../src/lib/server/db/schema';
import { cardChanges, createCard, getCard, moveUnitsToCard, reorderCards, setCardOpen, updateCard, listCards } from '../../src/lib/server/cards';
import { stationQueue } from '../../src/lib/server/stations';
import { subscribe, type LiveEvent } from '../../src/lib/server/live';
import { orderQueue, type CardForOrder } from '../../src/lib/domain/queue-order';
import { rng } from '../../src/lib/server/seed';

describe('two leads editing one card', () => {
	test('the second, stale save is refused with the current state; nothing is overwritten', () => {
		const shop = testShop();
		const made = createCard(shop.db, shop.actors.lead, { title: 'Rush the van units', style: 'rush', kind: 'rule', ruleModel: 'CH-F46' });
		expect(made.ok).toBe(true);
		if (!made.ok) return;
		const seen = made.card.version;

		const first = updateCard(shop.db, shop.actors.owner, made.card.id, seen, { title: 'Rush the van units — customer waiting', style: 'rush', kind: 'rule', ruleModel: 'CH-F46' });
		expect(first.ok).toBe(true);

		const second = updateCard(shop.db, shop.actors.lead, made.card.id, seen, { title: 'Van units, no hurry', style: 'plain', kind: 'rule', ruleModel: 'CH-F46' });
		expect(second.ok).toBe(false);
		if (second.ok) return;
		expect(second.status).toBe(409);
		expect(second.code).toBe('version_conflict');
		expect(second.message).toContain('Test owner changed “Rush the van units — customer waiting”');
		expect(second.message).toContain('Nothing of yours was saved');
		expect(second.current?.title).toBe('Rush the van units — customer waiting');
		expect(second.current?.version).toBe(seen + 1);

		const stored = getCard(shop.db, made.card.id)!;
		expect(stored.title).toBe('Rush the van units — customer waiting');
		expect(stored.style).toBe('rush');
		// the log has who and what, and no entry for the refused save
		const log = cardChanges(shop.db, made.card.id);
		expect(log.map((l) => l.kind)).toEqual(['edited', 'created']);
		expect(log[0].who).toBe('Test owner');
		expect(log[0].detail).toMatchObject({ title: { from: 'Rush the van units', to: 'Rush the van units — customer waiting' } });
	});

	test('closing with a stale version is refused too; a stale reorder moves nothing', () => {
		const shop = testShop();
		const a = createCard(shop.db, shop.actors.lead, { title: 'A', style: 'plain', kind: 'rule', ruleStage: 'paint' });
		const b = createCard(shop.db, shop.actors.lead, { title: 'B', style: 'plain', kind: 'rule', ruleStage: 'machine' });
		if (!a.ok || !b.ok) throw new Error('setup');
		const seen = listCards(shop.db).map((c) => ({ id: c.id, version: c.version }));
		expect(reorderCards(shop.db, shop.actors.owner, [seen[1], seen[0]]).ok).toBe(true);
		const stale = reorderCards(shop.db, shop.actors.lead, [seen[0], seen[1]]);
		expect(stale.ok).toBe(false);
		if (stale.ok) return;
		expect(stale.status).toBe(409);
		expect(stale.message).toContain('The board changed while you were reordering');
		expect(stale.cards.map((c) => c.title)).toEqual(['B', 'A']);
		expect(setCardOpen(shop.db, shop.actors.lead, a.card.id, a.card.version, false)).toMatchObject({ ok: false, status: 409 });
	});

	test('the change log is append-only', () => {
		const shop = testShop();
		const a = createCard(shop.db, shop.actors.lead, { title: 'A', style: 'plain', kind: 'units' });
		if (!a.ok) throw new Error('setup');
		expect(() => shop.db.update(priorityCardChange).set({ kind: 'x' }).run()).toThrow(/append-only/);
		expect(() => shop.db.delete(priorityCardChange).run()).toThrow(/append-only/);
	});
});

describe('cards order the station queues', () => {
	test('moving units between cards, reordering and closing change the queue, and each change is published', () => {
		const shop = testShop();
		const serials = shop.receive(6);
		const events: LiveEvent[] = [];
		const stop = subscribe((e) => events.push(e));
		const one = createCard(shop.db, shop.actors.lead, { title: 'Customer waiting', style: 'customer', kind: 'units', serials: `${serials[4]}, ${serials[5]}` });
		const two = createCard(shop.db, shop.actors.lead, { title: 'Kit for the swap', style: 'kit', kind: 'units', serials: serials[2] });
		if (!one.ok || !two.ok) throw new Error('setup');
		let q = stationQueue(shop.db, 'teardown').items;
		expect(q.map((i) => i.serial)).toEqual([serials[4], serials[5], serials[2], serials[0], serials[1], serials[3]]);
		expect(q[0].card).toEqual({ id: one.card.id, title: 'Customer waiting', style: 'customer' });
		expect(q[3].card).toBeNull();

		expect(moveUnitsToCard(shop.db, shop.actors.lead, [serials[4], serials[0]], two.card.id)).toMatchObject({ ok: true, moved: 2 });
		const cards = listCards(shop.db);
		expect(reorderCards(shop.db, shop.actors.lead, [cards[1], cards[0]].map((c) => ({ id: c.id, version: c.version }))).ok).toBe(true);
		q = stationQueue(shop.db, 'teardown').items;
		expect(q.map((i) => i.serial)).toEqual([serials[0], serials[2], serials[4], serials[5], serials[1], serials[3]]);

		const fresh = getCard(shop.db, two.card.id)!;
		expect(setCardOpen(shop.db, shop.actors.lead, fresh.id, fresh.version, false).ok).toBe(true);
		q = stationQueue(shop.db, 'teardown').items;
		expect(q[0].serial).toBe(serials[5]);
		stop();
		expect(events.filter((e) => e.topic === 'card').map((e) => e.kind)).toEqual(['created', 'created', 'units_moved', 'reordered', 'closed']);
	});

	test('a rule card cannot take units by hand; unknown serials are named', () => {
		const shop = testShop();
		const r = createCard(shop.db, shop.actors.lead, { title: 'Lathe work', style: 'finish', kind: 'rule', ruleStage: 'machine' });
		if (!r.ok) throw new Error('setup');
		expect(moveUnitsToCard(shop.db, shop.actors.lead, shop.receive(1), r.card.id)).toMatchObject({ ok: false, status: 400 });
		expect(createCard(shop.db, shop.actors.lead, { title: 'x', style: 'plain', kind: 'units', serials: 'SY-99999' })).toMatchObject({ ok: false, message: 'No unit SY-99999.' });
		expect(createCard(shop.db, shop.actors.lead, { title: 'x', style: 'plain', kind: 'rule' })).toMatchObject({ ok: false, message: 'A rule card needs a model, a stage or a lot.' });
	});

	test('the SQL order agrees with the domain rule on a random shop, and stays quick for thousands of units', () => {
		const shop = testShop();
		const random = rng(7);
		const models = [shop.modelId, ...['CH-V55', 'CH-P61'].map((code) => shop.db.insert(turboModel).values({ code, family: code[3] }).returning().get().id)];
		const lots = [shop.lotId, shop.db.insert(coreLot).values({ code: 'L-TEST-2', source: 'customer_return', receivedOn: '2026-11-29' }).returning().get().id];
		const N = 3000;
		const t0 = Date.now() - N * 60_000;
		const rows = Array.from({ length: N }, (_, i) => ({
			serial: `SY-${String(10000 + i).padStart(5, '0')}`,
			lotId: lots[Math.floor(random() * lots.length)],
			modelId: models[Math.floor(random() * models.length)],
			state: 'cleaned' as const,
			stateSince: new Date(t0 + Math.floor(random() * N) * 60_000),
			updatedAt: new Date()
		}));
		shop.db.transaction((tx) => {
			for (let i = 0; i < rows.length; i += 500) tx.insert(unit).values(rows.slice(i, i + 500)).run();
		});
		const kinds = ['units', 'rule'] as const;
		for (let c = 0; c < 25; c++) {
			const kind = kinds[c % 2];
			const ruleModel = kind === 'rule' && random() < 0.6 ? ['CH-F46', 'CH-V55', 'CH-P61'][Math.floor(random() * 3)] : '';
			const ruleLot = kind === 'rule' && random() < 0.4 ? 'L-TEST-2' : '';
			// a rule that is only a stage: at another stage it takes nothing here
			const ruleStage = kind === 'rule' ? (!ruleModel && !ruleLot ? 'paint' : random() < 0.5 ? 'machine' : '') : '';
			const res = createCard(shop.db, shop.actors.lead, {
				title: `Card ${c}`,
				style: 'plain',
				kind,
				dueOn: random() < 0.5 ? `2026-12-${String(1 + Math.floor(random() * 28)).padStart(2, '0')}` : '',
				ruleModel,
				ruleStage,
				ruleLot: ruleModel && ruleLot ? 'L-TEST-1' : ruleLot
			});
			if (!res.ok) throw new Error(res.message);
			if (kind === 'units') {
				const pick = Array.from({ length: 40 }, () => rows[Math.floor(random() * N)].serial);
				moveUnitsToCard(shop.db, shop.actors.lead, pick, res.card.id);
			}
		}
		// shuffle the board a little so ranks are not creation order
		const open = listCards(shop.db);
		const shuffled = [...open].sort(() => random() - 0.5).map((c) => ({ id: c.id, version: c.version }));
		expect(reorderCards(shop.db, shop.actors.lead, shuffled).ok).toBe(true);

		const started = performance.now();
		const q = stationQueue(shop.db, 'machine', N);
		const ms = performance.now() - started;
		expect(q.total).toBe(N);

		const cards = shop.db.select().from(priorityCard).all() as CardForOrder[];
		const members = new Map(shop.db.select().from(priorityCardUnit).all().map((m) => [m.unitId, m.cardId]));
		const units = shop.db.select().from(unit).where(eq(unit.state, 'cleaned')).all();
		const expected = orderQueue(cards, units.map((u) => ({ id: u.id, modelId: u.modelId, lotId: u.lotId, setCardId: members.get(u.id) ?? null, since: u.stateSince.getTime(), serial: u.serial })), 'machine');
		expect(q.items.map((i) => i.serial)).toEqual(expected.map((e) => e.unit.serial));
		expect(q.items.map((i) => i.card?.id ?? null)).toEqual(expected.map((e) => e.card?.id ?? null));
		expect(expected.some((e) => e.card?.kind === 'rule') && expected.some((e) => e.card?.kind === 'units') && expected.some((e) => !e.card)).toBe(true);
		// the board's first hundred: the carded units, then the oldest of the rest
		const carded = expected.filter((e) => e.card).length;
		for (const n of [100, carded - 3, carded, carded + 7]) {
			const top = stationQueue(shop.db, 'machine', n);
			expect(top.total).toBe(N);
			expect(top.items.map((i) => i.serial)).toEqual(expected.slice(0, n).map((e) => e.unit.serial));
		}
		// a queue with no card at all reads only the oldest
		const empty = stationQueue(shop.db, 'assemble', 10);
		expect(empty).toEqual({ items: [], total: 0 });
		console.log(`stationQueue: ${N} units, 25 cards, ${ms.toFixed(1)} ms`);
		expect(ms).toBeLessThan(2000);
		expect(shop.db.get<{ n: number }>(sql`select count(*) as n from priority_card_change`).n).toBeGreaterThan(25);
	});
});
