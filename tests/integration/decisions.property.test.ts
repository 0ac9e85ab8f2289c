/**
 * The decision reports (buying groups, comparison, cost per good core, the next skid; the
 * balancer's drift points; the plan's forecast method), recomputed in plain TypeScript from the
 * raw rows of small random shops, must equal what the SQL returns. The reference reads only
 * `unit_event` (replaying each unit's history for its state), the lot rows and the balance runs.
 */
import fc from 'fast-check';
import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { costPerGood } from '../../src/lib/domain/buying/cost-per-good';
import { newcombeDifference } from '../../src/lib/domain/buying/newcombe';
import { labourCents } from '../../src/lib/domain/stats/money';
import type { ActionName } from '../../src/lib/domain/units/actions';
import { decide } from '../../src/lib/domain/units/machine';
import type { UnitState } from '../../src/lib/domain/units/states';
import { chooseMethod } from '../../src/lib/domain/plan/method-choice';
import { pastWeeks, weekStart } from '../../src/lib/domain/plan/weeks';
import { openDatabase } from '../../src/lib/server/db/index';
import { balanceRun, coreLot, customerOrder, LOT_SOURCES, orderLine, station, supplier, turboModel, unit, unitEvent, user, type LotSource } from '../../src/lib/server/db/schema';
import { DEMO_STATIONS } from '../../src/lib/server/seed';
import { buyingGroups, compareGroups, costPerGoodReport, GROUP_KINDS, skidQuote, type GroupKind } from '../../src/lib/server/reports/buying';
import { driftPoints } from '../../src/lib/server/reports/drift';
import { setLabourRateCents } from '../../src/lib/server/reports/settings';
import { buildPlan } from '../../src/lib/server/plan';

const T0 = Date.UTC(2026, 8, 1);
const DAY = 86_400_000;
const CANDIDATES: ActionName[] = ['inspect', 'accept', 'scrap', 'clean', 'hold', 'release', 'machine'];
const labourArb = fc.oneof(fc.constant(undefined), fc.integer({ min: 0, max: 90 }), fc.constant(7.5), fc.constant(-3), fc.constant('20'));

const shopArb = fc.record({
	suppliers: fc.integer({ min: 1, max: 3 }),
	models: fc.integer({ min: 1, max: 3 }),
	lots: fc.array(fc.record({ source: fc.constantFrom(...LOT_SOURCES), supplier: fc.nat(), day: fc.integer({ min: 0, max: 60 }), cost: fc.integer({ min: 0, max: 9000 }) }), { minLength: 1, maxLength: 6 }),
	units: fc.array(
		fc.record({ lot: fc.nat(), model: fc.nat(), steps: fc.array(fc.record({ pick: fc.nat(), labour: labourArb }), { maxLength: 8 }) }),
		{ maxLength: 40 }
	),
	rate: fc.integer({ min: 0, max: 9000 })
});
type Shop = typeof shopArb extends fc.Arbitrary<infer T> ? T : never;

function build(shop: Shop) {
	const db = openDatabase(':memory:');
	const owner = randomUUID();
	db.insert(user).values({ id: owner, email: 'o@shop.test', name: 'Owner', role: 'owner', passwordHash: 'x' }).run();
	DEMO_STATIONS.forEach((s, i) => db.insert(station).values({ ...s, material: s.material ?? null, sortOrder: i }).run());
	setLabourRateCents(db, shop.rate);
	const supplierIds = Array.from({ length: shop.suppliers }, (_, i) => db.insert(supplier).values({ name: `Source ${i}` }).returning().get().id);
	const modelIds = Array.from({ length: shop.models }, (_, i) => db.insert(turboModel).values({ code: `M-${i}`, family: 'F' }).returning().get().id);
	const lots = shop.lots.map((l, i) => {
		const receivedOn = new Date(T0 + l.day * DAY).toISOString().slice(0, 10);
		const supplierId = l.source === 'purchased_skid' ? supplierIds[l.supplier % supplierIds.length] : null;
		const id = db.insert(coreLot).values({ code: `L-${i}`, source: l.source as LotSource, supplierId, receivedOn, costPerCoreCents: l.cost }).returning().get().id;
		return { id, receivedOn, source: l.source as LotSource, supplierId, cost: l.cost };
	});
	const units: { id: number; lot: (typeof lots)[number]; modelId: number; state: UnitState; events: { action: string; data: Record<string, unknown> | null }[] }[] = [];
	shop.units.forEach((u, n) => {
		let state: UnitState = 'received';
		let held = false;
		let holdReason: string | null = null;
		const rows: { action: string; toState: UnitState; data: Record<string, unknown> | null }[] = [{ action: 'receive', toState: 'received', data: null }];
		for (const s of u.steps) {
			const action = CANDIDATES[s.pick % CANDIDATES.length];
			const data: Record<string, unknown> = {};
			if (action === 'scrap') data.reasonCode = 'BORE';
			if (action === 'hold') data.reason = 'waiting for parts';
			if ((action === 'inspect' || action === 'accept' || action === 'scrap') && s.labour !== undefined) data.labourMinutes = s.labour;
			const d = decide({ serial: 'SY-00001', state, held, holdReason }, { action, role: 'owner', stationStage: null, data });
			if (!d.ok) continue;
			rows.push({ action, toState: d.to, data: Object.keys(d.data).length ? d.data : null });
			state = d.to;
			held = d.held;
			holdReason = d.holdReason;
		}
		const lot = lots[u.lot % lots.length];
		const modelId = modelIds[u.model % modelIds.length];
		const at = new Date(T0 + n * 60_000);
		const id = db.insert(unit).values({ serial: `SY-${String(n + 1).padStart(5, '0')}`, lotId: lot.id, modelId, state, held, holdReason, version: rows.length, stateSince: at, updatedAt: at }).returning().get().id;
		db.insert(unitEvent)
			.values(rows.map((r, i) => ({ unitId: id, seq: i + 1, fromState: null, toState: r.toState, action: r.action as ActionName, at, idempotencyKey: randomUUID(), data: r.data, userId: owner })))
			.run();
		// the reference replays the history for the state; it never reads the unit row
		units.push({ id, lot, modelId, state: rows[rows.length - 1].toState, events: rows });
	});
	return { db, owner, lots, units, supplierIds, modelIds };
}
type Built = ReturnType<typeof build>;

/** Buying groups from the events and lot rows alone. */
function referenceGroups(b: Built, kind: GroupKind, model?: number) {
	const keyOf = (u: Built['units'][number]) =>
		kind === 'supplier' ? (u.lot.supplierId === null ? null : String(u.lot.supplierId)) : kind === 'lot' ? String(u.lot.id) : kind === 'model' ? String(u.modelId) : u.lot.source;
	const m = new Map<string, { received: number; judged: number; scrapped: number; paid: number; minutes: number }>();
	for (const u of b.units) {
		if (model !== undefined && u.modelId !== model) continue;
		const k = keyOf(u);
		if (k === null) continue;
		const g = m.get(k) ?? { received: 0, judged: 0, scrapped: 0, paid: 0, minutes: 0 };
		g.received += 1;
		g.paid += u.lot.cost;
		const waiting = u.state === 'received' || u.state === 'inspected';
		if (!waiting) {
			g.judged += 1;
			for (const e of u.events) {
				const v = e.data?.labourMinutes;
				if (['inspect', 'accept', 'scrap'].includes(e.action) && typeof v === 'number' && v > 0) g.minutes += v;
			}
		}
		if (u.state === 'scrapped') g.scrapped += 1;
		m.set(k, g);
	}
	return m;
}

describe('decision reports: SQL equals a plain TypeScript recomputation', () => {
	it('buying groups, the comparison, cost per good core and the next skid', () => {
		fc.assert(
			fc.property(shopArb, fc.constantFrom(...GROUP_KINDS), fc.option(fc.nat(), { nil: undefined }), fc.integer({ min: 1, max: 500 }), fc.integer({ min: 1, max: 20000 }), (shop, kind, mPick, cores, price) => {
				const b = build(shop);
				const model = mPick === undefined ? undefined : b.modelIds[mPick % b.modelIds.length];
				const modelCode = model === undefined ? undefined : `M-${b.modelIds.indexOf(model)}`;
				const sql = buyingGroups(b.db, kind, { model: modelCode });
				const ref = referenceGroups(b, kind, model);
				expect(new Set(sql.map((g) => g.key))).toEqual(new Set(ref.keys()));
				for (const g of sql) {
					const r = ref.get(g.key)!;
					expect({ received: g.received, judged: g.judged, scrapped: g.scrapped, accepted: g.accepted, paid: g.pricePaidCents, minutes: g.labourMinutes }).toEqual({
						received: r.received,
						judged: r.judged,
						scrapped: r.scrapped,
						accepted: r.judged - r.scrapped,
						paid: r.paid,
						minutes: r.minutes
					});
				}
				// cost per good core: (price + labour per core) ÷ accept rate, ranked by the upper end
				const cost = costPerGoodReport(b.db, kind, { model: modelCode });
				for (const row of cost.rows) {
					const r = ref.get(row.key)!;
					const expected = costPerGood({ priceCents: r.paid / r.received, labourCents: r.judged ? labourCents(r.minutes, shop.rate) / r.judged : 0, accepted: r.judged - r.scrapped, judged: r.judged });
					expect(row.cost).toEqual(expected);
				}
				const uppers = cost.rows.map((r) => r.cost.highCents ?? Infinity);
				expect(uppers).toEqual([...uppers].sort((x, y) => x - y));
				// the comparison of the first two groups
				const [ka, kb] = [...ref.keys()].sort();
				const ra = ka === undefined ? undefined : ref.get(ka);
				const rb = kb === undefined ? undefined : ref.get(kb);
				const got = ka !== undefined && kb !== undefined ? compareGroups(b.db, kind, ka, kb, { model: modelCode }) : null;
				expect(got?.difference ?? null).toEqual(ra && rb ? newcombeDifference(ra.scrapped, ra.judged, rb.scrapped, rb.judged) : null);
				// the next skid from the first supplier
				const sup = b.supplierIds[0];
				const q = skidQuote(b.db, { supplier: sup, model: modelCode, cores, priceCents: price })!;
				const rs = referenceGroups(b, 'supplier', model).get(String(sup)) ?? { received: 0, judged: 0, scrapped: 0, paid: 0, minutes: 0 };
				const acc = rs.judged - rs.scrapped;
				expect(q.history.judged).toBe(rs.judged);
				expect(q.quote.goodExpected).toEqual(rs.judged ? (cores * acc) / rs.judged : null);
				expect(q.quote.cost).toEqual(costPerGood({ priceCents: price, labourCents: rs.judged ? labourCents(rs.minutes, shop.rate) / rs.judged : 0, accepted: acc, judged: rs.judged }));
			}),
			{ numRuns: 40 }
		);
	});

	it('balancer drift points: the final passing run of each build, latest N in time order', () => {
		const runArb = fc.record({
			unit: fc.nat(),
			build: fc.integer({ min: 1, max: 3 }),
			passed: fc.boolean(),
			res: fc.tuple(fc.double({ min: 0, max: 50, noNaN: true }), fc.double({ min: 0, max: 50, noNaN: true })),
			tol: fc.tuple(fc.double({ min: 0.5, max: 60, noNaN: true }), fc.double({ min: 0.5, max: 60, noNaN: true })),
			minute: fc.integer({ min: 0, max: 5000 })
		});
		fc.assert(
			fc.property(fc.array(runArb, { maxLength: 60 }), fc.integer({ min: 2, max: 30 }), (runs, last) => {
				const b = build({ suppliers: 1, models: 1, lots: [{ source: 'purchased_skid', supplier: 0, day: 0, cost: 100 }], units: Array.from({ length: 5 }, () => ({ lot: 0, model: 0, steps: [] })), rate: 0 });
				const runNo = new Map<number, number>();
				const rows = runs.map((r) => {
					const u = b.units[r.unit % b.units.length].id;
					const no = (runNo.get(u) ?? 0) + 1;
					runNo.set(u, no);
					const row = b.db
						.insert(balanceRun)
						.values({
							unitId: u, runNo: no, afterSeq: r.build, kind: 'check', unbalanceUnit: 'g', compAmount: 1, compAngle: 0, turbAmount: 1, turbAngle: 0, method: 'direct',
							residualCompGmm: r.res[0], residualTurbGmm: r.res[1], tolCompGmm: r.tol[0], tolTurbGmm: r.tol[1], passed: r.passed,
							compWheelSerial: 'CW-1', shaftWheelSerial: 'SW-1', userId: b.owner, at: new Date(T0 + r.minute * 60_000)
						})
						.returning()
						.get();
					return { ...row, at: row.at.getTime() };
				});
				const finals = rows.filter((r) => r.passed && !rows.some((o) => o.unitId === r.unitId && o.afterSeq === r.afterSeq && o.passed && o.runNo > r.runNo));
				const expected = finals
					.sort((x, y) => y.at - x.at || y.id - x.id)
					.slice(0, last)
					.reverse()
					.map((r) => ({ runId: r.id, comp: r.residualCompGmm! / r.tolCompGmm, turb: r.residualTurbGmm! / r.tolTurbGmm }));
				const got = driftPoints(b.db, { last }).map((p) => ({ runId: p.runId, comp: p.comp, turb: p.turb }));
				expect(got.map((g) => g.runId)).toEqual(expected.map((e) => e.runId));
				got.forEach((g, i) => {
					expect(g.comp).toBeCloseTo(expected[i].comp, 12);
					expect(g.turb).toBeCloseTo(expected[i].turb, 12);
				});
			}),
			{ numRuns: 40 }
		);
	});

	it('the plan: weekly history from the orders, and the forecast of the chosen method', () => {
		fc.assert(
			fc.property(fc.array(fc.record({ day: fc.integer({ min: 0, max: 90 }), qty: fc.integer({ min: 1, max: 30 }), cancelled: fc.boolean() }), { maxLength: 30 }), fc.integer({ min: 0, max: 40 }), (orders, ramp) => {
				const b = build({ suppliers: 1, models: 1, lots: [{ source: 'purchased_skid', supplier: 0, day: 0, cost: 100 }], units: [], rate: 0 });
				const now = new Date('2026-12-02T09:00:00Z');
				const today = '2026-12-02';
				const weeks = pastWeeks(today, 12);
				// a ramp on top of the random orders, one order per past week
				const all = [...orders.map((o) => ({ on: new Date(Date.parse('2026-09-01') + o.day * DAY).toISOString().slice(0, 10), qty: o.qty, cancelled: o.cancelled })), ...weeks.map((w, i) => ({ on: w, qty: 1 + Math.round((ramp * i) / 10), cancelled: false }))];
				all.forEach((o, i) => {
					const id = b.db.insert(customerOrder).values({ ref: `R-${i}`, channel: 'web', customer: '', orderedOn: o.on, status: o.cancelled ? 'cancelled' : 'fulfilled', createdBy: b.owner }).returning().get().id;
					b.db.insert(orderLine).values({ orderId: id, modelId: b.modelIds[0], quantity: o.qty }).run();
				});
				const history = weeks.map((w) => all.filter((o) => !o.cancelled && o.on >= weeks[0] && o.on < weekStart(today) && weekStart(o.on) === w).reduce((s, o) => s + o.qty, 0));
				const p = buildPlan(b.db, now).models[0];
				expect(p.history).toEqual(history);
				const c = chooseMethod(history, 0.3);
				expect(p.choice.method).toBe(c.method);
				expect(p.forecast).toBeCloseTo(c.forecast, 12);
				expect(p.suggested).toBe(Math.max(0, Math.ceil(Math.max(c.forecast, 0) - 1e-9)));
			}),
			{ numRuns: 25 }
		);
	});
});
