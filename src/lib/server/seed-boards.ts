/**
 * Demo rows for the floor boards: home stations for the demo techs, a teardown checklist for
 * the performance family (P), and a qualification record for every seeded P unit that got its
 * teardown verdict, so the accept guard's rule holds for the demo history too. Families
 * without a checklist (F, V, K in the demo) are accepted on the verdict alone.
 */
import { and, eq, inArray } from 'drizzle-orm';
import type { Tx } from './db';
import { checklist, checklistItem, inspection, inspectionAnswer, station, turboModel, unit, unitEvent, user, userStation } from './db/schema';

export const DEMO_CHECKLIST_FAMILY = 'P';

/** Items of common practice at teardown; the measurement units are the shop's choice. */
export const DEMO_CHECKLIST_ITEMS: { label: string; measureUnit: string | null; failsFor: string[] }[] = [
	{ label: 'Turbine housing cracks', measureUnit: null, failsFor: ['TH-CRACK'] },
	{ label: 'Wheel damage or rub', measureUnit: null, failsFor: ['WHEEL-RUB'] },
	{ label: 'Shaft and journal wear', measureUnit: 'mm', failsFor: ['SHAFT-WEAR'] },
	{ label: 'Bearing bore', measureUnit: 'mm', failsFor: ['BORE'] },
	{ label: 'Flange and thread damage', measureUnit: null, failsFor: ['FLANGE', 'CH-DAMAGE'] },
	{ label: 'Wastegate or actuator condition', measureUnit: null, failsFor: ['WG-SEIZED', 'VANES'] }
];

export function seedBoards(tx: Tx, random: () => number): { inspections: number } {
	const people = tx.select().from(user).all();
	const stations = tx.select().from(station).all();
	const idOf = (code: string) => stations.find((s) => s.code === code)?.id;
	const homes: Record<string, string[]> = {
		'rui@corvidhill.example': ['TEARDOWN-1'],
		'dana@corvidhill.example': ['WASH', 'BLAST']
	};
	for (const p of people) {
		for (const code of homes[p.email] ?? []) {
			const sid = idOf(code);
			if (sid) tx.insert(userStation).values({ userId: p.id, stationId: sid }).run();
		}
	}

	const list = tx.insert(checklist).values({ family: DEMO_CHECKLIST_FAMILY, name: 'Performance family teardown' }).returning().get();
	const items = DEMO_CHECKLIST_ITEMS.map((it, i) =>
		tx.insert(checklistItem).values({ checklistId: list.id, label: it.label, measureUnit: it.measureUnit, sortOrder: i + 1 }).returning().get()
	);

	const teardown = idOf('TEARDOWN-1');
	if (!teardown) return { inspections: 0 };
	const verdicts = tx
		.select({ unitId: unit.id, seq: unitEvent.seq, action: unitEvent.action, at: unitEvent.at, userId: unitEvent.userId, data: unitEvent.data })
		.from(unitEvent)
		.innerJoin(unit, eq(unit.id, unitEvent.unitId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.where(and(eq(turboModel.family, DEMO_CHECKLIST_FAMILY), eq(unitEvent.stationId, teardown), inArray(unitEvent.action, ['accept', 'scrap'])))
		.all();
	for (const v of verdicts) {
		const reason = v.action === 'scrap' ? String(v.data?.reasonCode ?? '') : null;
		const rec = tx
			.insert(inspection)
			.values({ unitId: v.unitId, checklistId: list.id, verdict: v.action as 'accept' | 'scrap', reasonCode: reason, userId: v.userId, stationId: teardown, eventSeq: v.seq, at: v.at })
			.returning({ id: inspection.id })
			.get();
		DEMO_CHECKLIST_ITEMS.forEach((spec, i) => {
			const failed = reason !== null && spec.failsFor.includes(reason);
			// invented demo measurements around a 10 mm journal and a 16 mm bore
			const measurement = spec.measureUnit ? Math.round(((i === 2 ? 9.99 : 15.99) + random() * 0.02) * 1000) / 1000 : null;
			tx.insert(inspectionAnswer)
				.values({ inspectionId: rec.id, itemId: items[i].id, label: spec.label, result: failed ? 'fail' : 'pass', measurement, measureUnit: spec.measureUnit })
				.run();
		});
	}
	return { inspections: verdicts.length };
}
