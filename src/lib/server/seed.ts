/**
 * The demo shop: an invented remanufacturer, its people, stations, suppliers, models and
 * about 400 units spread over every state with consistent histories. Every history is
 * produced by the real state machine, so replaying it gives the stored state.
 */
import { sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import type { Role } from '../domain/auth/roles';
import type { ActionName } from '../domain/units/actions';
import { decide } from '../domain/units/machine';
import type { Stage, UnitState } from '../domain/units/states';
import { hashPassword } from './auth';
import type { Db } from './db';
import { allocateSerials } from './units';
import { demoBuildRecords } from './seed-balance';
import { demoTeardownPhotos, seedCustomerOrders } from './seed-customer';
import { keepIfCommitted } from './photos';
import { seedIntakeDemo } from './seed-intake';
import { seedLeadBoard } from './seed-lead';
import { seedBoards } from './seed-boards';
import { seedReportsDemo } from './seed-reports';
import { coreLot, scrapReason, station, supplier, turboModel, unit, unitEvent, user, type LotSource } from './db/schema';

export const DEMO_SHOP = 'Corvid Hill Turbo Works';

export const DEMO_USERS: { name: string; email: string; role: Role; password: string }[] = [
	{ name: 'Ines Varga', email: 'ines@corvidhill.example', role: 'owner', password: 'owner-demo-2026' },
	{ name: 'Tomas Okafor', email: 'tomas@corvidhill.example', role: 'lead', password: 'lead-demo-2026' },
	{ name: 'Rui Almeida', email: 'rui@corvidhill.example', role: 'tech', password: 'tech-demo-2026' },
	{ name: 'Dana Whitlock', email: 'dana@corvidhill.example', role: 'tech', password: 'tech-demo-2026' },
	{ name: 'Priya Castell', email: 'priya@corvidhill.example', role: 'office', password: 'office-demo-2026' }
];

export const DEMO_STATIONS: { code: string; name: string; stage: Stage; material?: 'aluminium' | 'cast_iron'; overdueHours: number }[] = [
	{ code: 'TEARDOWN-1', name: 'Teardown 1', stage: 'teardown', overdueHours: 48 },
	{ code: 'WASH', name: 'Wash', stage: 'clean', overdueHours: 24 },
	{ code: 'BLAST', name: 'Blast', stage: 'clean', overdueHours: 24 },
	{ code: 'LATHE-A', name: 'Lathe A (aluminium)', stage: 'machine', material: 'aluminium', overdueHours: 48 },
	{ code: 'LATHE-B', name: 'Lathe B (cast iron)', stage: 'machine', material: 'cast_iron', overdueHours: 48 },
	{ code: 'PAINT', name: 'Paint', stage: 'paint', overdueHours: 24 },
	{ code: 'BUILD-1', name: 'Build 1', stage: 'assemble', overdueHours: 24 },
	{ code: 'BUILD-2', name: 'Build 2', stage: 'assemble', overdueHours: 24 },
	{ code: 'BALANCE', name: 'Balance', stage: 'balance', overdueHours: 12 },
	{ code: 'PACK', name: 'Pack', stage: 'pack', overdueHours: 24 },
	{ code: 'SHIP', name: 'Ship', stage: 'ship', overdueHours: 48 }
];

export const DEMO_MODELS = [
	{ code: 'CH-F46', family: 'F', description: 'Fixed geometry, wastegated; 2.0 L four-cylinder petrol saloon, fictional years' },
	{ code: 'CH-F52', family: 'F', description: 'Fixed geometry, wastegated; 3.0 L six-cylinder diesel van, fictional years' },
	{ code: 'CH-F58', family: 'F', description: 'Fixed geometry, wastegated; 4.5 L six-cylinder diesel tractor, fictional years' },
	{ code: 'CH-V49', family: 'V', description: 'Variable vane; 2.2 L four-cylinder diesel crossover, fictional years' },
	{ code: 'CH-V55', family: 'V', description: 'Variable vane; 6.6 L V8 diesel pickup, fictional years' },
	{ code: 'CH-P61', family: 'P', description: 'Larger-wheel performance build of a fixed unit; 5.9 L six-cylinder diesel pickup' },
	{ code: 'CH-P66', family: 'P', description: 'Larger-wheel performance build of a fixed unit; 6.7 L six-cylinder diesel pickup' },
	{ code: 'CH-K60', family: 'K', description: 'Sold in a conversion kit; generic 5.0 L V8 petrol swap' }
];

export const DEMO_SCRAP_REASONS = [
	{ code: 'TH-CRACK', label: 'Turbine housing cracked', category: 'housing' },
	{ code: 'CH-DAMAGE', label: 'Compressor housing damaged', category: 'housing' },
	{ code: 'FLANGE', label: 'Flange or thread damage', category: 'housing' },
	{ code: 'WHEEL-RUB', label: 'Wheel rub or blade damage beyond repair', category: 'rotating' },
	{ code: 'SHAFT-WEAR', label: 'Shaft or journal worn past limit', category: 'rotating' },
	{ code: 'BORE', label: 'Bearing bore oversize', category: 'bearing housing' },
	{ code: 'WG-SEIZED', label: 'Wastegate or actuator seized', category: 'controls' },
	{ code: 'VANES', label: 'Vane mechanism seized or broken', category: 'controls' },
	{ code: 'POROSITY', label: 'Casting porosity found in machining', category: 'housing' },
	{ code: 'INCOMPLETE', label: 'Core incomplete (parts missing)', category: 'core' }
];

const DEMO_SUPPLIERS = [
	{ name: 'Ashgrove Core Exchange', notes: 'Large skids, mixed quality.', scrapRate: 0.22, cost: 4500 },
	{ name: 'Ninemile Salvage & Parts', notes: 'Cheap, high scrap.', scrapRate: 0.42, cost: 2500 },
	{ name: 'Pellworth Fleet Services', notes: 'Fleet pulls, good cores.', scrapRate: 0.1, cost: 6500 }
];

/** A small deterministic random source (mulberry32), so the demo is the same every time. */
export function rng(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

export function isEmpty(db: Db): boolean {
	return (db.select({ n: sql<number>`count(*)` }).from(user).get()?.n ?? 0) === 0;
}

const ROUTE: { action: ActionName; stage: Stage; stations: string[] }[] = [
	{ action: 'inspect', stage: 'teardown', stations: ['TEARDOWN-1'] },
	{ action: 'accept', stage: 'teardown', stations: ['TEARDOWN-1'] },
	{ action: 'clean', stage: 'clean', stations: ['WASH', 'BLAST'] },
	{ action: 'machine', stage: 'machine', stations: ['LATHE-A', 'LATHE-B'] },
	{ action: 'paint', stage: 'paint', stations: ['PAINT'] },
	{ action: 'assemble', stage: 'assemble', stations: ['BUILD-1', 'BUILD-2'] },
	{ action: 'balance', stage: 'balance', stations: ['BALANCE'] },
	{ action: 'pack', stage: 'pack', stations: ['PACK'] },
	{ action: 'ship', stage: 'ship', stations: ['SHIP'] }
];

export interface SeedOptions {
	now?: Date;
	seed?: number;
	/** Lots to create (the last ones are the youngest and least far along). */
	lots?: number;
}

/** Seed the demo shop into an empty database. Returns counts of what was made. */
export async function seedDemo(db: Db, options: SeedOptions = {}): Promise<{ users: number; lots: number; units: number; events: number }> {
	const now = options.now ?? new Date();
	const random = rng(options.seed ?? 20261201);
	const lotCount = options.lots ?? 15;
	const hashes = new Map<string, string>();
	for (const u of DEMO_USERS) if (!hashes.has(u.password)) hashes.set(u.password, await hashPassword(u.password));
	// photo files are staged first and linked once the rows that point at them commit, as on the floor
	const staged = await demoTeardownPhotos();
	const photos = staged.photos;

	return keepIfCommitted(staged, () => db.transaction((tx) => {
		const userIds = DEMO_USERS.map((u) => {
			const id = randomUUID();
			tx.insert(user).values({ id, name: u.name, email: u.email, role: u.role, passwordHash: hashes.get(u.password)! }).run();
			return { id, role: u.role };
		});
		const techs = userIds.filter((u) => u.role === 'tech');
		const lead = userIds.find((u) => u.role === 'lead')!;
		const office = userIds.find((u) => u.role === 'office')!;

		const stationIds = new Map<string, number>();
		DEMO_STATIONS.forEach((s, i) => {
			const r = tx.insert(station).values({ ...s, material: s.material ?? null, sortOrder: i }).returning({ id: station.id }).get();
			stationIds.set(s.code, r.id);
		});
		const modelIds = DEMO_MODELS.map((m) => tx.insert(turboModel).values(m).returning({ id: turboModel.id }).get().id);
		const build = demoBuildRecords(tx, DEMO_MODELS.map((m, i) => ({ id: modelIds[i], code: m.code })), now);
		const reasons = DEMO_SCRAP_REASONS.map((r) => {
			tx.insert(scrapReason).values(r).run();
			return r.code;
		});
		const supplierIds = DEMO_SUPPLIERS.map((s) => tx.insert(supplier).values({ name: s.name, notes: s.notes }).returning({ id: supplier.id }).get().id);

		const day = 86_400_000;
		let units = 0;
		let events = 0;
		for (let l = 0; l < lotCount; l++) {
			// Oldest lot about ten weeks ago, the newest this morning.
			const ageDays = Math.round(((lotCount - 1 - l) / Math.max(1, lotCount - 1)) * 70);
			const receivedAt = new Date(now.getTime() - ageDays * day - 6 * 3_600_000);
			const kind = l % 6;
			const source: LotSource = kind === 4 ? 'customer_return' : kind === 5 && l > 6 ? 'warranty_return' : 'purchased_skid';
			const sIdx = l % 3;
			const sup = source === 'purchased_skid' ? DEMO_SUPPLIERS[sIdx] : null;
			const size = source === 'purchased_skid' ? 24 + Math.floor(random() * 24) : 4 + Math.floor(random() * 6);
			const code = `L${receivedAt.toISOString().slice(2, 10).replaceAll('-', '')}-${String(l + 1).padStart(2, '0')}`;
			const lot = tx
				.insert(coreLot)
				.values({
					code,
					source,
					supplierId: sup ? supplierIds[sIdx] : null,
					receivedOn: receivedAt.toISOString().slice(0, 10),
					costPerCoreCents: sup ? sup.cost : 0,
					expectedCount: size,
					notes: sup ? `Skid from ${sup.name}.` : source === 'customer_return' ? 'Customer units for rebuild.' : 'Returned under warranty.',
					createdAt: receivedAt
				})
				.returning({ id: coreLot.id })
				.get();
			const serials = allocateSerials(tx, size);
			const scrapRate = sup?.scrapRate ?? 0.15;
			// How far along the lot is: old lots are mostly shipped, new ones mostly waiting.
			const progress = ageDays / 70;
			for (let i = 0; i < size; i++) {
				const serial = serials[i];
				const modelId = modelIds[Math.floor(random() * modelIds.length)];
				const steps = Math.min(ROUTE.length, Math.floor(progress * 11 + random() * 4 - 1));
				const scrapAt = random() < scrapRate ? (random() < 0.8 ? 1 : 2 + Math.floor(random() * 5)) : -1;
				let t = receivedAt.getTime();
				let state = 'received' as UnitState;
				let held = false;
				let holdReason: string | null = null;
				const rows: (typeof unitEvent.$inferInsert)[] = [];
				let seq = 1;
				rows.push({
					unitId: 0,
					seq,
					fromState: null,
					toState: 'received',
					action: 'receive',
					userId: office.id,
					at: new Date(t),
					idempotencyKey: `seed:${serial}:1`
				});
				const push = (action: ActionName, stationCode: string | null, actor: { id: string; role: Role }, data: Record<string, unknown> = {}) => {
					const stage = stationCode ? DEMO_STATIONS.find((s) => s.code === stationCode)!.stage : null;
					const facts = build.before(action, { modelId, seq, at: new Date(t), actor, stationId: stationCode ? stationIds.get(stationCode)! : null });
					const d = decide({ serial, state, held, holdReason }, { action, role: actor.role, stationStage: stage, data }, facts);
					if (!d.ok) throw new Error(`demo seed made an impossible move: ${d.message}`);
					t = Math.min(t + (2 + random() * 30) * 3_600_000 * (ageDays > 0 ? 1 : 0.05), now.getTime() - 60_000);
					seq += 1;
					rows.push({
						unitId: 0,
						seq,
						fromState: d.from,
						toState: d.to,
						action,
						stationId: stationCode ? stationIds.get(stationCode)! : null,
						userId: actor.id,
						at: new Date(t),
						idempotencyKey: `seed:${serial}:${seq}`,
						data: Object.keys(d.data).length ? d.data : null
					});
					state = d.to;
					held = d.held;
					holdReason = d.holdReason;
				};
				let stateSince = t;
				for (let s = 0; s < steps; s++) {
					const step = ROUTE[s];
					const tech = techs[Math.floor(random() * techs.length)];
					const at = step.stations[Math.floor(random() * step.stations.length)];
					if (s === scrapAt) {
						const code = s === 1 ? reasons[Math.floor(random() * 8)] : 'POROSITY';
						push('scrap', s === 1 ? 'TEARDOWN-1' : null, s === 1 ? tech : lead, { reasonCode: code });
						stateSince = t;
						break;
					}
					push(step.action, at, tech);
					stateSince = t;
					if (step.action === 'balance' && random() < 0.06) {
						push('rework', null, lead, { toStage: 'assemble', reason: 'Balance check out of tolerance' });
						push('assemble', 'BUILD-1', tech);
						push('balance', 'BALANCE', tech);
						stateSince = t;
					}
				}
				if (state !== 'scrapped' && state !== 'shipped' && random() < 0.04) {
					push('hold', null, lead, { reason: random() < 0.5 ? 'Waiting for a compressor wheel' : 'Customer asked to pause' });
				}
				const created = tx
					.insert(unit)
					.values({
						serial,
						originalTag: `${['AX', 'QT', 'MR', 'ZK'][Math.floor(random() * 4)]}-${Math.floor(100000 + random() * 899999)}`,
						lotId: lot.id,
						modelId,
						state,
						held,
						holdReason,
						version: seq,
						stateSince: new Date(stateSince),
						createdAt: receivedAt,
						updatedAt: new Date(t)
					})
					.returning({ id: unit.id })
					.get();
				for (const r of rows) tx.insert(unitEvent).values({ ...r, unitId: created.id }).run();
				build.flush(created.id);
				units += 1;
				events += rows.length;
			}
		}
		seedCustomerOrders(tx, { now, random, shopName: DEMO_SHOP, office, tech: techs[0], stationIds, modelIds, photos });
		seedIntakeDemo(tx);
		seedLeadBoard(tx, { now, random, leadId: lead.id, officeId: office.id });
		seedBoards(tx, random);
		seedReportsDemo(tx, now, random, build);
		// Count what is there now: the other demo sections add lots, units and events of their own.
		const count = (t: typeof coreLot | typeof unit | typeof unitEvent) => tx.select({ n: sql<number>`count(*)` }).from(t).get()?.n ?? 0;
		void units;
		void events;
		return { users: userIds.length, lots: count(coreLot), units: count(unit), events: count(unitEvent) };
	}));
}

