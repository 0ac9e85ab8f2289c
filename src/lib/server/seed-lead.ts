/**
 * Demo rows for the lead's board: priority cards and about twelve weeks of orders from the
 * depots, the web shop and walk-ins. Invented; deterministic from the demo's random source.
 */
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Tx } from './db';
import { addDays, pastWeeks, weekStart } from '../domain/plan/weeks';
import { ORDER_CHANNELS, type OrderChannel } from '../domain/orders/channels';
import { customerOrder, orderLine, priorityCard, priorityCardChange, priorityCardUnit, turboModel, unit } from './db/schema';

const CUSTOMERS = ['Bramble Lane Haulage', 'Tessel Farm Co-op', 'Oriel Street Garage', 'Marrow Point Ferries', 'Kestrel Vale Plant Hire'];

/** Typical weekly units per model (invented), so the plan has something to smooth. */
const WEEKLY: Record<string, number> = { 'CH-F46': 20, 'CH-F52': 30, 'CH-F58': 3, 'CH-V49': 5, 'CH-V55': 30, 'CH-P61': 2, 'CH-P66': 1.5, 'CH-K60': 4 };
/** A newly launched kit whose orders ramp up week by week from its pre-orders (invented): units per week by week index. */
const RAMPING: Record<string, (week: number) => number> = { 'CH-K60': (wi) => 1 + 2.5 * wi };

export function seedLeadBoard(tx: Tx, o: { now: Date; random: () => number; leadId: string; officeId: string }): { orders: number; cards: number } {
	const { now, random } = o;
	const today = now.toISOString().slice(0, 10);
	const models = tx.select({ id: turboModel.id, code: turboModel.code }).from(turboModel).all();
	const channelsWeighted: OrderChannel[] = ['north', 'north', 'lakes', 'plains', 'coast', 'coast', 'web', 'web', 'web', 'walk_in'];

	// Orders: each past week, a few orders per channel; this week's and last week's stay open.
	let n = 0;
	const weeks = [...pastWeeks(today, 12), weekStart(today)];
	for (const [wi, week] of weeks.entries()) {
		for (const ch of ORDER_CHANNELS) {
			const lines = models
				.map((m) => {
					const share = channelsWeighted.filter((c) => c === ch).length / channelsWeighted.length;
					const ramp = RAMPING[m.code];
					const mean = ramp ? ramp(wi) * share : (WEEKLY[m.code] ?? 2) * share * (1 + 0.25 * Math.sin(wi / 2));
					const qty = Math.floor(mean + random() * 1.6 - 0.3);
					return { modelId: m.id, quantity: qty };
				})
				.filter((l) => l.quantity > 0);
			if (lines.length === 0) continue;
			n += 1;
			const orderedOn = addDays(week, Math.floor(random() * 5));
			if (orderedOn > today) continue;
			const recent = wi >= weeks.length - 2;
			const id = tx
				.insert(customerOrder)
				.values({
					ref: `${ch === 'walk_in' ? 'WI' : ch === 'web' ? 'WEB' : ch.slice(0, 2).toUpperCase() + 'D'}-${week.replaceAll('-', '').slice(2)}-${String(n).padStart(3, '0')}`,
					channel: ch,
					customer: ch === 'walk_in' ? CUSTOMERS[Math.floor(random() * CUSTOMERS.length)] : '',
					orderedOn,
					dueOn: addDays(orderedOn, ch === 'walk_in' ? 5 : 10),
					status: recent ? 'open' : random() < 0.05 ? 'cancelled' : 'fulfilled',
					createdBy: o.officeId
				})
				.returning({ id: customerOrder.id })
				.get().id;
			for (const l of lines) tx.insert(orderLine).values({ orderId: id, ...l }).run();
		}
	}

	// Cards.
	const at = new Date(now.getTime() - 3 * 3_600_000);
	const modelId = (code: string) => models.find((m) => m.code === code)!.id;
	// the lot with the most units waiting for the lathes
	const busyLot =
		tx
			.select({ id: unit.lotId, n: sql<number>`count(*)` })
			.from(unit)
			.where(eq(unit.state, 'cleaned'))
			.groupBy(unit.lotId)
			.orderBy(desc(sql`count(*)`), asc(unit.lotId))
			.get()?.id ?? null;
	const waiting = tx
		.select({ id: unit.id })
		.from(unit)
		.where(and(inArray(unit.state, ['machined', 'painted', 'cleaned']), eq(unit.held, false)))
		.orderBy(asc(unit.id))
		.all();
	const pick = (k: number) => Array.from({ length: Math.min(k, waiting.length) }, () => waiting.splice(Math.floor(random() * waiting.length), 1)[0].id);
	const cards: { title: string; style: 'rush' | 'customer' | 'restock' | 'finish' | 'kit'; kind: 'units' | 'rule'; dueOn: string | null; rule?: Partial<typeof priorityCard.$inferInsert>; units?: number[] }[] = [
		{ title: 'Rush — Bramble Lane Haulage truck is waiting', style: 'rush', kind: 'units', dueOn: addDays(today, 1), units: pick(3) },
		{ title: 'Customer rebuilds promised for Friday', style: 'customer', kind: 'units', dueOn: addDays(today, 3), units: pick(4) },
		{ title: 'Restock CH-V55 for Coast Depot', style: 'restock', kind: 'rule', dueOn: addDays(today, 6), rule: { ruleModelId: modelId('CH-V55') } },
		{ title: 'Finish the older skid on the lathes first', style: 'finish', kind: 'rule', dueOn: null, rule: { ruleStage: 'machine', ruleLotId: busyLot } },
		{ title: 'Conversion kits for the swap shop', style: 'kit', kind: 'rule', dueOn: addDays(today, 10), rule: { ruleModelId: modelId('CH-K60') } }
	];
	cards.forEach((c, i) => {
		const id = tx
			.insert(priorityCard)
			.values({ title: c.title, style: c.style, kind: c.kind, dueOn: c.dueOn, rank: i + 1, ...(c.rule ?? {}), createdBy: o.leadId, updatedBy: o.leadId, createdAt: at, updatedAt: at })
			.returning({ id: priorityCard.id })
			.get().id;
		tx.insert(priorityCardChange).values({ cardId: id, userId: o.leadId, at, kind: 'created', detail: { title: c.title, style: c.style, kind: c.kind, rank: i + 1 } }).run();
		for (const u of c.units ?? []) tx.insert(priorityCardUnit).values({ unitId: u, cardId: id, addedAt: at }).run();
	});
	return { orders: n, cards: cards.length };
}
