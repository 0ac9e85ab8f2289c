/**
 * Bulk loading for benchmarks: many lots, units and events at once through prepared
 * statements in large transactions. The histories follow the good route (or end in a
 * scrap), so replaying any unit gives its stored state. SQLite-specific on purpose.
 */
import { FLOW, type UnitState } from '../../domain/units/states';
import { formatSerial } from '../../domain/units/serial';
import type { Db } from './index';

export interface BulkOptions {
	lots: number;
	units: number;
	/** Target number of events (about; histories are whole). */
	events: number;
	/** Days back the oldest lot arrived. */
	spanDays?: number;
	now?: Date;
	random?: () => number;
	onProgress?: (done: number, total: number) => void;
}

const ACTION_FOR: Partial<Record<UnitState, string>> = {
	inspected: 'inspect',
	accepted: 'accept',
	cleaned: 'clean',
	machined: 'machine',
	painted: 'paint',
	assembled: 'assemble',
	balanced: 'balance',
	packed: 'pack',
	shipped: 'ship'
};

/** Where in the route each state's move is made, by station code. */
const STATION_FOR: Partial<Record<UnitState, string[]>> = {
	inspected: ['TEARDOWN-1'],
	accepted: ['TEARDOWN-1'],
	cleaned: ['WASH', 'BLAST'],
	machined: ['LATHE-A', 'LATHE-B'],
	painted: ['PAINT'],
	assembled: ['BUILD-1', 'BUILD-2'],
	balanced: ['BALANCE'],
	packed: ['PACK'],
	shipped: ['SHIP']
};

export function bulkLoad(db: Db, o: BulkOptions): { lots: number; units: number; events: number } {
	const sqlite = db.$client;
	const random = o.random ?? Math.random;
	const now = (o.now ?? new Date()).getTime();
	const span = (o.spanDays ?? 5 * 365) * 86_400_000;
	const users = sqlite.prepare(`select id, role from user`).all() as { id: string; role: string }[];
	const techs = users.filter((u) => u.role === 'tech').map((u) => u.id);
	const office = users.find((u) => u.role === 'office')?.id ?? users[0].id;
	const lead = users.find((u) => u.role === 'lead')?.id ?? users[0].id;
	const stations = new Map((sqlite.prepare(`select id, code from station`).all() as { id: number; code: string }[]).map((s) => [s.code, s.id]));
	const models = (sqlite.prepare(`select id from turbo_model`).all() as { id: number }[]).map((m) => m.id);
	const suppliers = (sqlite.prepare(`select id from supplier`).all() as { id: number }[]).map((s) => s.id);
	const reasons = (sqlite.prepare(`select code from scrap_reason`).all() as { code: string }[]).map((r) => r.code);
	if (!techs.length || !models.length || !suppliers.length || !reasons.length) throw new Error('bulkLoad needs the base shop (users, stations, models, suppliers, reasons) first');

	const counterRow = sqlite.prepare(`select value from counter where name = 'unit_serial'`).get() as { value: number } | undefined;
	let serialN = counterRow?.value ?? 0;
	const insLot = sqlite.prepare(
		`insert into core_lot (code, source, supplier_id, received_on, cost_per_core_cents, expected_count, notes, created_at) values (?, ?, ?, ?, ?, ?, '', ?)`
	);
	const insUnit = sqlite.prepare(
		`insert into unit (serial, original_tag, lot_id, model_id, state, held, hold_reason, priority, version, state_since, notes, created_at, updated_at) values (?, ?, ?, ?, ?, 0, null, 0, ?, ?, '', ?, ?)`
	);
	const insEvent = sqlite.prepare(
		`insert into unit_event (unit_id, seq, from_state, to_state, action, station_id, user_id, at, idempotency_key, note, data) values (?, ?, ?, ?, ?, ?, ?, ?, ?, null, ?)`
	);
	const unitsPerLot = o.units / o.lots;
	let units = 0;
	let events = 0;
	const batch = sqlite.transaction((fromLot: number, toLot: number) => {
		for (let l = fromLot; l < toLot; l++) {
			const receivedAt = now - span + Math.floor((l / o.lots) * span);
			const age = (now - receivedAt) / span; // 1 = oldest
			const source = l % 10 === 9 ? 'customer_return' : 'purchased_skid';
			const lotRes = insLot.run(
				`B${String(l + 1).padStart(5, '0')}`,
				source,
				source === 'purchased_skid' ? suppliers[l % suppliers.length] : null,
				new Date(receivedAt).toISOString().slice(0, 10),
				2500 + (l % 5) * 1000,
				Math.round(unitsPerLot),
				receivedAt
			);
			const lotId = Number(lotRes.lastInsertRowid);
			const count = Math.round(((l + 1) * o.units) / o.lots) - Math.round((l * o.units) / o.lots);
			const scrapRate = [0.12, 0.35, 0.08][l % 3];
			for (let i = 0; i < count; i++) {
				serialN += 1;
				const serial = formatSerial(serialN);
				// History is finished work; only the youngest lots are still on the floor, spread over the stages.
				const onFloor = age < 0.06;
				const reach = onFloor ? 1 + Math.floor(random() * 9) : FLOW.length;
				const scrapAt = random() < scrapRate ? 2 : -1; // scrapped at the verdict
				let t = receivedAt + Math.floor(random() * 3_600_000);
				const history: [string | null, string, string, string | null, string][] = [[null, 'received', 'receive', null, office]];
				let state: UnitState = 'received';
				for (let s = 1; s < reach; s++) {
					if (s === scrapAt) {
						history.push([state, 'scrapped', 'scrap', 'TEARDOWN-1', techs[s % techs.length]]);
						state = 'scrapped';
						break;
					}
					const next = FLOW[s];
					const codes = STATION_FOR[next]!;
					history.push([state, next, ACTION_FOR[next]!, codes[Math.floor(random() * codes.length)], s === 9 ? lead : techs[(s + i) % techs.length]]);
					state = next;
				}
				// Holds and releases fill the history to the target event count, as on a real floor.
				const target = Math.round(((units + 1) * o.events) / o.units);
				const ended = state === 'scrapped' || state === 'shipped';
				while (events + history.length + 2 <= target && history.length < 40) {
					const at = 1 + Math.floor(random() * (ended ? history.length - 1 : history.length));
					const here = history[at - 1][1];
					history.splice(at, 0, [here, here, 'hold', null, lead], [here, here, 'release', null, lead]);
				}
				const stepMs = Math.max(60_000, Math.min(6 * 3_600_000, (now - t) / (history.length + 1)));
				const times = history.map((_, k) => (k === 0 ? t : (t += Math.floor(stepMs * (0.5 + random())))));
				const last = times[times.length - 1];
				const u = insUnit.run(serial, `BT-${serialN}`, lotId, models[serialN % models.length], state, history.length, last, receivedAt, last);
				const unitId = Number(u.lastInsertRowid);
				history.forEach(([from, to, action, station, user], k) => {
					insEvent.run(
						unitId,
						k + 1,
						from,
						to,
						action,
						station ? (stations.get(station) ?? null) : null,
						user,
						times[k],
						`bulk:${serial}:${k + 1}`,
						action === 'scrap'
							? JSON.stringify({ reasonCode: reasons[serialN % reasons.length] })
							: action === 'hold'
								? JSON.stringify({ reason: 'Waiting for parts' })
								: null
					);
				});
				units += 1;
				events += history.length;
			}
		}
	});
	const step = Math.max(1, Math.floor(o.lots / 50));
	for (let l = 0; l < o.lots; l += step) {
		batch(l, Math.min(o.lots, l + step));
		o.onProgress?.(Math.min(o.lots, l + step), o.lots);
	}
	sqlite.prepare(`insert into counter (name, value) values ('unit_serial', ?) on conflict(name) do update set value = excluded.value`).run(serialN);
	sqlite.pragma('optimize');
	return { lots: o.lots, units, events };
}
