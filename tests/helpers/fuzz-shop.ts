/**
 * The fuzzer's shop: a demo database with units kept for the teardown moves, orders with a live
 * status link and a quote in play, and the fixtures the targets draw their valid requests from.
 * Everything is made through the real services before the server opens the file.
 */
import Database from 'better-sqlite3';
import Stripe from 'stripe';
import sharp from 'sharp';
import { asc, eq } from 'drizzle-orm';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { coreLot, turboModel, user } from '../../src/lib/server/db/schema';
import { applyMove, receiveUnits, type Actor } from '../../src/lib/server/units';
import { createRebuildOrder } from '../../src/lib/server/rebuild-orders';
import { addQuoteLine, decideQuote, sendQuote } from '../../src/lib/server/quotes';
import { paymentConfig } from '../../src/lib/server/payments';
import { specSchema } from '../../src/lib/domain/balance/spec';
import type { FuzzFixtures } from '../fuzz/targets';
import { DEMO_PEOPLE } from './server';

function actor(db: Db, email: string): Actor {
	const u = db.select().from(user).where(eq(user.email, email)).get()!;
	return { id: u.id, role: u.role };
}

const STAGE_OF_STATE: Record<string, string> = {
	received: 'teardown',
	inspected: 'teardown',
	accepted: 'clean',
	cleaned: 'machine',
	machined: 'paint',
	painted: 'assemble',
	assembled: 'balance',
	balanced: 'pack',
	packed: 'ship'
};
export { STAGE_OF_STATE };

export interface Prepared {
	fresh: string[];
	forQualification: string[];
	liveOrderIds: number[];
	tokens: string[];
	/** What each live order is kept for: paying (approved), approving, declining (sent), the office's quote work (draft). */
	liveRoles: LiveRole[];
}

export type LiveRole = 'pay' | 'approve' | 'decline' | 'draft' | 'scrap';
const LIVE_ROLES: LiveRole[] = ['pay', 'pay', 'approve', 'approve', 'approve', 'decline', 'decline', 'decline', 'draft', 'draft', 'scrap', 'scrap'];

/** Units for the teardown moves (family with a checklist) and twelve orders behind live links, their quotes in each state the customer and the office act on. */
export function prepareFuzzShop(file: string, units = 120): Prepared {
	const db = openDatabase(file);
	try {
		const office = actor(db, DEMO_PEOPLE.office.email);
		const lead = actor(db, DEMO_PEOPLE.lead.email);
		const lot = db.select().from(coreLot).where(eq(coreLot.source, 'purchased_skid')).orderBy(asc(coreLot.id)).get()!;
		const model = db.select().from(turboModel).where(eq(turboModel.family, 'P')).orderBy(asc(turboModel.id)).get()!;
		const fresh = receiveUnits(db, office, lot.id, Array.from({ length: units }, () => ({ modelId: model.id })));
		const forQualification = receiveUnits(db, office, lot.id, Array.from({ length: Math.ceil(units / 2) }, () => ({ modelId: model.id })));
		for (const serial of forQualification) {
			const r = applyMove(db, lead, { serial, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: `fuzz-prep-${serial}` });
			if (!r.ok) throw new Error(`prepare ${serial}: ${r.message}`);
		}
		const liveOrderIds: number[] = [];
		const tokens: string[] = [];
		for (const [i, role] of LIVE_ROLES.entries()) {
			const made = createRebuildOrder(db, office, {
				customerName: `Fuzz Customer ${i + 1}`,
				email: `fuzz${i + 1}@customer.example`,
				phone: '',
				shipAddress: '3 Quarry Row, Westmere',
				modelCode: 'CH-F46',
				originalTag: `FZ-${i + 1}`,
				complaint: 'Smokes at idle.',
				promisedOn: '',
				notifyReceived: true,
				notifyQuote: true,
				notifyInWork: true,
				notifyShipped: true
			});
			for (const action of ['inspect', 'accept'] as const) {
				const r = applyMove(db, lead, { serial: made.serial, action, idempotencyKey: `fuzz-prep-${made.serial}-${action}` });
				if (!r.ok) throw new Error(`prepare order ${made.order.id} ${action}: ${r.message}`);
			}
			addQuoteLine(db, made.order.id, { kind: 'part', description: 'Bearing kit', quantity: '1', unitPrice: '100.00' });
			if (role !== 'draft') sendQuote(db, made.order.id);
			if (role === 'pay') decideQuote(db, made.order.id, { decision: 'approve' });
			// declined, the customer asking us to scrap it: for the office's scrap action
			if (role === 'scrap') decideQuote(db, made.order.id, { decision: 'decline', choice: 'scrap' });
			liveOrderIds.push(made.order.id);
			tokens.push(made.token);
		}
		return { fresh, forQualification, liveOrderIds, tokens, liveRoles: LIVE_ROLES };
	} finally {
		db.$client.close();
	}
}

/** The fixtures, read from the prepared database through a read-only connection. */
export async function fuzzFixtures(file: string, origin: string, prepared: Prepared, victimEmail: string): Promise<FuzzFixtures> {
	const conn = new Database(file, { readonly: true });
	try {
		const pluck = <T = string>(sql: string, ...args: unknown[]) => conn.prepare(sql).pluck().all(...args) as T[];
		const kept = new Set([...prepared.fresh, ...prepared.forQualification]);
		const byState: Record<string, string[]> = {};
		for (const row of conn.prepare(`select serial, state from unit where not held order by serial`).all() as { serial: string; state: string }[]) {
			if (!kept.has(row.serial)) (byState[row.state] ??= []).push(row.serial);
		}
		const stations: Record<string, string[]> = {};
		for (const row of conn.prepare(`select code, stage from station order by sort_order`).all() as { code: string; stage: string }[]) (stations[row.stage] ??= []).push(row.code);
		const modelCodes = pluck(`select code from turbo_model order by id`);
		const specRow = conn.prepare(`select s.* from model_spec s join turbo_model t on t.id = s.model_id where t.code = ?`).get(modelCodes[0]) as Record<string, unknown>;
		const spec: Record<string, string> = {};
		for (const k of Object.keys(specSchema.shape)) {
			const col = k.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
			const v = specRow[col];
			spec[k] = v === null || v === undefined ? '' : String(v);
		}
		const png = await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 90, g: 110, b: 130 } } }).png().toBuffer();
		const jpeg = await sharp(png).jpeg().toBuffer();
		const pay = paymentConfig(process.env);
		const stripe = new Stripe(pay.secretKey, { telemetry: false });
		return {
			origin,
			serials: pluck(`select min(serial) from unit group by state, held order by 1`),
			byState,
			held: pluck(`select serial from unit where held order by serial`),
			fresh: prepared.fresh,
			forQualification: prepared.forQualification,
			stationCodes: pluck(`select code from station order by sort_order`),
			stations,
			scrapReasons: pluck(`select code from scrap_reason where active order by code`),
			victimId: pluck(`select id from user where email = ?`, victimEmail)[0],
			ownerId: pluck(`select id from user where email = ?`, DEMO_PEOPLE.owner.email)[0],
			emails: [...Object.values(DEMO_PEOPLE).map((p) => p.email), victimEmail, 'nobody@corvidhill.example'],
			lotCodes: pluck(`select code from core_lot order by id`),
			modelCodes,
			orderIds: pluck<number>(`select id from rebuild_order order by id`),
			liveOrderIds: prepared.liveOrderIds,
			tokens: prepared.tokens,
			liveRoles: prepared.liveRoles,
			warrantyReturns: pluck(`select u.serial from unit u join core_lot l on l.id = u.lot_id where l.source = 'warranty_return' and u.return_of_unit_id is null order by u.serial`),
			lockedKey: 'account:locked-out@corvidhill.example',
			checklistIds: pluck<number>(`select id from checklist order by id`),
			checklistItemIds: pluck<number>(`select i.id from checklist_item i join checklist c on c.id = i.checklist_id where c.family = 'P' and i.active order by i.id`),
			supplierIds: pluck<number>(`select id from supplier order by id`),
			cardIds: pluck<number>(`select id from priority_card where open order by rank`),
			demandOrderIds: pluck<number>(`select id from customer_order order by id limit 20`),
			photoIds: pluck<number>(`select p.id from unit_photo p join rebuild_order o on o.unit_id = p.unit_id order by p.id limit 20`),
			photoOrderIds: pluck<number>(`select distinct o.id from unit_photo p join rebuild_order o on o.unit_id = p.unit_id order by o.id`),
			spec,
			png,
			jpeg,
			sign: (payload) => stripe.webhooks.generateTestHeaderString({ payload, secret: pay.webhookSecret })
		};
	} finally {
		conn.close();
	}
}

export interface UnitPlace {
	lotCode: string;
	orderId: number | null;
	state: string;
	lastStation: string | null;
}

/** Where a unit shows up: its lot, its customer order, its state and the station of its latest entry. */
export function unitPlaces(conn: Database.Database, serials: string[]): Map<string, UnitPlace> {
	const out = new Map<string, UnitPlace>();
	const q = conn.prepare(`
		select u.serial, l.code as lotCode, o.id as orderId, u.state,
			(select s.code from unit_event e join station s on s.id = e.station_id where e.unit_id = u.id order by e.seq desc limit 1) as lastStation
		from unit u join core_lot l on l.id = u.lot_id left join rebuild_order o on o.unit_id = u.id
		where u.serial = ?`);
	for (const s of serials) {
		const row = q.get(s) as (UnitPlace & { serial: string }) | undefined;
		if (row) out.set(s, row);
	}
	return out;
}
