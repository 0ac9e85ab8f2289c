/**
 * Demo rows for the owner's reports: a labour rate, a skid whose scrap is clearly above its
 * p-chart limit (with teardown labour recorded), a steady stream of recent work so the flow
 * figures have something to measure, and warranty returns of shipped units with the failure
 * mode their teardown found. Invented, deterministic (uses the seed's random source).
 */
import { and, asc, eq } from 'drizzle-orm';
import type { Role } from '../domain/auth/roles';
import type { ActionName } from '../domain/units/actions';
import { decide } from '../domain/units/machine';
import type { UnitState } from '../domain/units/states';
import { FAILURE_MODES, type FailureMode } from '../domain/warranty/failure-modes';
import type { DbOrTx } from './db';
import { coreLot, station, supplier, turboModel, unit, unitEvent, user, type LotSource } from './db/schema';
import { setLabourRateCents } from './reports/settings';
import { allocateSerials } from './units';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

type Step = { action: ActionName; station: string | null; data?: Record<string, unknown>; afterHours: number; by?: 'tech' | 'lead' };

interface Ctx {
	tx: DbOrTx;
	random: () => number;
	now: number;
	stations: Map<string, { id: number; stage: (typeof station.$inferSelect)['stage'] }>;
	techs: { id: string; role: Role }[];
	lead: { id: string; role: Role };
	office: { id: string; role: Role };
	/** Makes the balance and assembly records a move needs, so seeded histories stay valid. */
	build?: BuildRecorder;
}

export interface BuildRecorder {
	before(action: ActionName, ctx: { modelId: number; seq: number; at: Date; actor: { id: string; role: Role }; stationId: number | null }): Record<string, unknown>;
	flush(unitId: number): void;
}

/** Make one unit with its history through the real state machine; returns its id. */
function makeUnit(c: Ctx, lotId: number, modelId: number, serial: string, receivedAt: number, steps: Step[], returnOfUnitId: number | null = null): number {
	let state: UnitState = 'received';
	let held = false;
	let holdReason: string | null = null;
	let t = receivedAt;
	const rows: (typeof unitEvent.$inferInsert)[] = [
		{ unitId: 0, seq: 1, fromState: null, toState: 'received', action: 'receive', userId: c.office.id, at: new Date(t), idempotencyKey: `seed-r:${serial}:1` }
	];
	let stateSince = t;
	for (const step of steps) {
		const next = t + step.afterHours * HOUR;
		if (next > c.now - 60_000) break;
		const actor = step.by === 'lead' ? c.lead : c.techs[Math.floor(c.random() * c.techs.length)];
		const st = step.station ? c.stations.get(step.station)! : null;
		const facts = c.build?.before(step.action, { modelId, seq: rows.length, at: new Date(next), actor, stationId: st?.id ?? null }) ?? {};
		const d = decide({ serial, state, held, holdReason }, { action: step.action, role: actor.role, stationStage: st?.stage ?? null, data: step.data ?? {} }, facts);
		if (!d.ok) throw new Error(`report demo made an impossible move: ${d.message}`);
		t = next;
		rows.push({
			unitId: 0,
			seq: rows.length + 1,
			fromState: d.from,
			toState: d.to,
			action: step.action,
			stationId: st?.id ?? null,
			userId: actor.id,
			at: new Date(t),
			idempotencyKey: `seed-r:${serial}:${rows.length + 1}`,
			data: Object.keys(d.data).length ? d.data : null
		});
		if (d.to !== state) stateSince = t;
		state = d.to;
		held = d.held;
		holdReason = d.holdReason;
	}
	const id = c.tx
		.insert(unit)
		.values({
			serial,
			originalTag: `RX-${Math.floor(100000 + c.random() * 899999)}`,
			lotId,
			modelId,
			state,
			held,
			holdReason,
			version: rows.length,
			stateSince: new Date(stateSince),
			createdAt: new Date(receivedAt),
			updatedAt: new Date(t),
			returnOfUnitId
		})
		.returning({ id: unit.id })
		.get().id;
	for (const r of rows) c.tx.insert(unitEvent).values({ ...r, unitId: id }).run();
	c.build?.flush(id);
	return id;
}

const GOOD_ROUTE: [ActionName, string[]][] = [
	['clean', ['WASH', 'BLAST']],
	['machine', ['LATHE-A', 'LATHE-B']],
	['paint', ['PAINT']],
	['assemble', ['BUILD-1', 'BUILD-2']],
	['balance', ['BALANCE']],
	['pack', ['PACK']],
	['ship', ['SHIP']]
];

function goodRoute(c: Ctx, hoursEach: () => number): Step[] {
	return GOOD_ROUTE.map(([action, st]) => ({ action, station: st[Math.floor(c.random() * st.length)], afterHours: hoursEach() }));
}

function lotCode(at: number, n: number): string {
	return `L${new Date(at).toISOString().slice(2, 10).replaceAll('-', '')}-${n}`;
}

function newLot(c: Ctx, code: string, source: LotSource, supplierId: number | null, at: number, count: number, cost: number, notes: string) {
	return c.tx
		.insert(coreLot)
		.values({ code, source, supplierId, receivedOn: new Date(at).toISOString().slice(0, 10), costPerCoreCents: cost, expectedCount: count, notes, createdAt: new Date(at) })
		.returning({ id: coreLot.id })
		.get().id;
}

export function seedReportsDemo(tx: DbOrTx, nowDate: Date, random: () => number, build?: BuildRecorder): void {
	const now = nowDate.getTime();
	const people = tx.select({ id: user.id, role: user.role }).from(user).all();
	const c: Ctx = {
		tx,
		random,
		now,
		stations: new Map(tx.select({ code: station.code, id: station.id, stage: station.stage }).from(station).all().map((s) => [s.code, s])),
		techs: people.filter((p) => p.role === 'tech'),
		lead: people.find((p) => p.role === 'lead')!,
		office: people.find((p) => p.role === 'office')!,
		build
	};
	const models = tx.select({ id: turboModel.id, code: turboModel.code }).from(turboModel).orderBy(asc(turboModel.id)).all();
	const cheap = tx.select({ id: supplier.id }).from(supplier).where(eq(supplier.name, 'Ninemile Salvage & Parts')).get();
	const fleet = tx.select({ id: supplier.id }).from(supplier).where(eq(supplier.name, 'Pellworth Fleet Services')).get();
	if (!cheap || !fleet || models.length === 0 || c.techs.length === 0) return;

	setLabourRateCents(tx, 6500, nowDate); // 65.00 an hour, invented

	// A skid that went badly: 21 of 30 cores scrapped at teardown, with the teardown time recorded.
	const badAt = now - 50 * DAY;
	const badLot = newLot(c, lotCode(badAt, 91), 'purchased_skid', cheap.id, badAt, 30, 2500, 'Skid from Ninemile Salvage & Parts; many cores had sat outside.');
	const badSerials = allocateSerials(tx, 30);
	const badReasons = ['VANES', 'VANES', 'TH-CRACK', 'TH-CRACK', 'BORE', 'WHEEL-RUB'];
	badSerials.forEach((serial, i) => {
		const minutes = 20 + Math.floor(random() * 40);
		const teardown: Step = { action: 'inspect', station: 'TEARDOWN-1', afterHours: 4 + i, data: { labourMinutes: minutes } };
		const verdict: Step =
			i < 21
				? { action: 'scrap', station: 'TEARDOWN-1', afterHours: 1, data: { reasonCode: badReasons[i % badReasons.length], labourMinutes: 10 } }
				: { action: 'accept', station: 'TEARDOWN-1', afterHours: 1, data: { labourMinutes: 10 } };
		makeUnit(c, badLot, models[(i * 3) % models.length].id, serial, badAt, [teardown, verdict, ...(i < 21 ? [] : goodRoute(c, () => 6 + random() * 20))]);
	});

	// Steady recent work: a fleet skid arriving a few cores a day over six weeks, each flowing on.
	const streamDays = 42;
	const streamAt = now - streamDays * DAY;
	const streamLot = newLot(c, lotCode(streamAt, 92), 'purchased_skid', fleet.id, streamAt, 84, 6500, 'Fleet pulls, delivered in batches.');
	const streamSerials = allocateSerials(tx, 84);
	streamSerials.forEach((serial, i) => {
		const arrive = streamAt + (i / 84) * streamDays * DAY;
		const scrapIt = random() < 0.1;
		const steps: Step[] = [
			{ action: 'inspect', station: 'TEARDOWN-1', afterHours: 4 + random() * 20, data: { labourMinutes: 25 + Math.floor(random() * 20) } },
			scrapIt
				? { action: 'scrap', station: 'TEARDOWN-1', afterHours: 1, data: { reasonCode: 'SHAFT-WEAR' } }
				: { action: 'accept', station: 'TEARDOWN-1', afterHours: 1 }
		];
		if (!scrapIt) steps.push(...goodRoute(c, () => 8 + random() * 30));
		// The stream lot is received as one skid (one received date) but taken into the shop over time.
		makeUnit(c, streamLot, models[Math.floor(random() * models.length)].id, serial, arrive, steps);
	});

	// Warranty returns of shipped units, each torn down and given a failure mode.
	const shipped = tx
		.select({ id: unit.id, modelId: unit.modelId })
		.from(unit)
		.where(and(eq(unit.state, 'shipped')))
		.orderBy(asc(unit.id))
		.limit(60)
		.all();
	const picks = shipped.filter((_, i) => i % 9 === 0).slice(0, 6);
	if (picks.length === 0) return;
	const wAt = now - 12 * DAY;
	const wLot = newLot(c, lotCode(wAt, 93), 'warranty_return', null, wAt, picks.length, 0, 'Returned under warranty through the depots.');
	const wSerials = allocateSerials(tx, picks.length);
	const modes: FailureMode[] = ['oil_starvation', 'oil_contamination', 'foreign_object_damage', 'bearing_failure', 'oil_starvation', 'seal_leakage'];
	picks.forEach((orig, i) => {
		const mode = modes[i % modes.length] ?? FAILURE_MODES[0];
		const scrapIt = mode === 'foreign_object_damage' || mode === 'oil_starvation';
		const steps: Step[] = [
			{ action: 'inspect', station: 'TEARDOWN-1', afterHours: 6 + i * 5, data: { labourMinutes: 40 } },
			scrapIt
				? { action: 'scrap', station: 'TEARDOWN-1', afterHours: 2, data: { reasonCode: 'WHEEL-RUB', failureMode: mode } }
				: { action: 'accept', station: 'TEARDOWN-1', afterHours: 2, data: { failureMode: mode } }
		];
		makeUnit(c, wLot, orig.modelId, wSerials[i], wAt + i * HOUR, steps, orig.id);
	});
	// One return still waiting for its teardown, so the verdict form has something to do.
	const last = shipped[shipped.length - 1];
	if (last && !picks.some((p) => p.id === last.id)) {
		const [serial] = allocateSerials(tx, 1);
		makeUnit(c, wLot, last.modelId, serial, wAt + 20 * HOUR, [{ action: 'inspect', station: 'TEARDOWN-1', afterHours: 3 }], last.id);
	}
}
