/**
 * Warranty returns by parts lot: the SQL aggregate against a plain-TypeScript recount of the
 * same rows (units, every assembly record, the returns and their verdict events), on random
 * small shops in a migrated in-memory database.
 */
import fc from 'fast-check';
import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { wilsonInterval } from '../../src/lib/domain/stats/proportion';
import { FAILURE_MODES, isFailureMode } from '../../src/lib/domain/warranty/failure-modes';
import { lotAboveShop, PART_KINDS, type PartKind } from '../../src/lib/domain/warranty/parts-lots';
import { assemblyRecord, coreLot, turboModel, unit, unitEvent } from '../../src/lib/server/db/schema';
import { partsLotReport } from '../../src/lib/server/reports/warranty';
import type { UnitState } from '../../src/lib/domain/units/states';
import { testShop } from '../helpers/db';

const DAY = 86_400_000;
const T0 = Date.UTC(2026, 9, 1);
const BK = ['BK-1', 'BK-2', 'BK-3'];
const SK = ['SK-1', 'SK-2'];
const STATES: UnitState[] = ['shipped', 'shipped', 'shipped', 'packed', 'assembled', 'scrapped'];

const shopArb = fc.record({
	units: fc.array(
		fc.record({
			state: fc.constantFrom(...STATES),
			model: fc.nat({ max: 1 }),
			// Every assembly record of the unit, oldest first: day, bearing kit lot, seal kit lot.
			records: fc.array(fc.record({ day: fc.integer({ min: 0, max: 30 }), bk: fc.constantFrom(...BK), sk: fc.constantFrom(...SK) }), { maxLength: 3 }),
			// Warranty returns of the unit (linked only when it shipped), with what their teardown found.
			returns: fc.array(fc.record({ verdict: fc.constantFrom('accept', 'scrap', null), mode: fc.constantFrom(...FAILURE_MODES, 'not-a-mode', undefined) }), { maxLength: 2 })
		}),
		{ maxLength: 30 }
	),
	from: fc.option(fc.integer({ min: 0, max: 30 }), { nil: undefined }),
	span: fc.integer({ min: 0, max: 30 }),
	model: fc.option(fc.nat({ max: 1 }), { nil: undefined })
});

type Shop = typeof shopArb extends fc.Arbitrary<infer T> ? T : never;
const dayOf = (d: number) => new Date(T0 + d * DAY + 3_600_000).toISOString().slice(0, 10);

function build(s: Shop) {
	const shop = testShop();
	const { db, actors } = shop;
	const models = [shop.modelId, db.insert(turboModel).values({ code: 'CH-F47', family: 'F' }).returning().get().id];
	const wLot = db.insert(coreLot).values({ code: 'L-W-1', source: 'warranty_return', receivedOn: '2026-11-01', costPerCoreCents: 0 }).returning().get().id;
	let n = 0;
	const serial = () => `SY-${String(++n).padStart(5, '0')}`;
	const base = { originalTag: '', version: 1, stateSince: new Date(T0), updatedAt: new Date(T0) };
	s.units.forEach((u) => {
		const id = db.insert(unit).values({ ...base, serial: serial(), lotId: shop.lotId, modelId: models[u.model], state: u.state }).returning().get().id;
		u.records.forEach((r, i) =>
			db
				.insert(assemblyRecord)
				.values({ unitId: id, afterSeq: i + 1, endPlayMm: 0.05, radialPlayMm: 0.4, bearingKitLot: r.bk, sealKitLot: r.sk, compWheelSerial: 'CW-1', shaftWheelSerial: 'SW-1', withinLimits: true, findings: [], userId: actors.tech.id, at: new Date(T0 + r.day * DAY + 3_600_000) })
				.run()
		);
		if (u.state !== 'shipped') return;
		for (const r of u.returns) {
			const state: UnitState = r.verdict === 'accept' ? 'accepted' : r.verdict === 'scrap' ? 'scrapped' : 'inspected';
			const rid = db.insert(unit).values({ ...base, serial: serial(), lotId: wLot, modelId: models[u.model], state, returnOfUnitId: id }).returning().get().id;
			const ev = (seq: number, action: 'receive' | 'inspect' | 'accept' | 'scrap', toState: UnitState, data: Record<string, unknown> | null) =>
				db.insert(unitEvent).values({ unitId: rid, seq, fromState: null, toState, action, userId: actors.tech.id, at: new Date(T0 + seq * 60_000), idempotencyKey: randomUUID(), data }).run();
			ev(1, 'receive', 'received', null);
			ev(2, 'inspect', 'inspected', null);
			if (r.verdict) ev(3, r.verdict, state, r.mode === undefined ? (r.verdict === 'scrap' ? { reasonCode: 'BORE' } : null) : { failureMode: r.mode, ...(r.verdict === 'scrap' ? { reasonCode: 'BORE' } : {}) });
		}
	});
	return { db, models };
}

/** The same report from the generated rows alone. */
function reference(s: Shop) {
	const from = s.from === undefined ? undefined : dayOf(s.from);
	const to = s.from === undefined ? undefined : dayOf(s.from + s.span);
	const inView = s.units.filter((u) => {
		const latest = u.records[u.records.length - 1];
		if (!latest) return false;
		const day = dayOf(latest.day);
		return (!from || day >= from) && (!to || day <= to) && (s.model === undefined || u.model === s.model);
	});
	const shipped = inView.filter((u) => u.state === 'shipped');
	const shop = { shipped: shipped.length, returned: shipped.filter((u) => u.returns.length > 0).length };
	const lots = new Map<string, { built: number; shipped: number; returned: number; modes: Map<string, number> }>();
	for (const u of inView) {
		const latest = u.records[u.records.length - 1]!;
		for (const kind of PART_KINDS) {
			const code = kind === 'bearing_kit' ? latest.bk : latest.sk;
			const key = `${kind}|${code}`;
			const l = lots.get(key) ?? { built: 0, shipped: 0, returned: 0, modes: new Map() };
			l.built += 1;
			if (u.state === 'shipped') {
				l.shipped += 1;
				if (u.returns.length) l.returned += 1;
				for (const r of u.returns) {
					const m = r.verdict && isFailureMode(r.mode) ? r.mode : 'not_recorded';
					l.modes.set(m, (l.modes.get(m) ?? 0) + 1);
				}
			}
			lots.set(key, l);
		}
	}
	return { shop, lots, filter: { from, to } };
}

describe('warranty returns by parts lot', () => {
	it('counts built, shipped and returned units and the failure-mode mix per lot as a plain recount does', () => {
		fc.assert(
			fc.property(shopArb, (s) => {
				const { db } = build(s);
				const ref = reference(s);
				const got = partsLotReport(db, { ...ref.filter, model: s.model === undefined ? undefined : ['CH-F46', 'CH-F47'][s.model] });
				expect({ shipped: got.shop.shipped, returned: got.shop.returned }).toEqual(ref.shop);
				const shopRate = ref.shop.shipped ? ref.shop.returned / ref.shop.shipped : null;
				const gotLots = Object.fromEntries(
					got.lots.map((l) => [`${l.kind}|${l.lot}`, { built: l.built, shipped: l.shipped, returned: l.returned, modes: Object.fromEntries(l.modes.map((m) => [m.mode, m.count])), flagged: l.flagged }])
				);
				const wantLots = Object.fromEntries(
					[...ref.lots].map(([k, l]) => [k, { built: l.built, shipped: l.shipped, returned: l.returned, modes: Object.fromEntries(l.modes), flagged: lotAboveShop(l.returned, l.shipped, shopRate) }])
				);
				expect(gotLots).toEqual(wantLots);
				for (const l of got.lots) {
					const ci = wilsonInterval(l.returned, l.shipped);
					expect(l.low).toBe(ci?.low ?? null);
				}
				db.$client.close();
			}),
			{ numRuns: 60 }
		);
	});

	it('flags a bearing lot that comes back far more often than the shop', () => {
		const units: Shop['units'] = [];
		const rec = (bk: string) => [{ day: 3, bk, sk: 'SK-1' }];
		// 8 of 20 on the bad lot came back; 1 of 60 on the others.
		for (let i = 0; i < 20; i++) units.push({ state: 'shipped', model: 0, records: rec('BK-1'), returns: i < 8 ? [{ verdict: 'scrap', mode: 'bearing_failure' }] : [] });
		for (let i = 0; i < 60; i++) units.push({ state: 'shipped', model: 0, records: rec(i % 2 ? 'BK-2' : 'BK-3'), returns: i === 0 ? [{ verdict: 'accept', mode: 'oil_contamination' }] : [] });
		const { db } = build({ units, from: undefined, span: 0, model: undefined });
		const got = partsLotReport(db);
		expect(got.shop).toMatchObject({ shipped: 80, returned: 9 });
		const bad = got.lots[0];
		expect(bad).toMatchObject({ kind: 'bearing_kit' satisfies PartKind, lot: 'BK-1', shipped: 20, returned: 8, flagged: true, modes: [{ mode: 'bearing_failure', count: 8 }] });
		expect(got.lots.filter((l) => l.flagged)).toHaveLength(1);
		db.$client.close();
	});
});
