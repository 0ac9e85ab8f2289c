/**
 * The tallies the scrap report and the boards read are kept by triggers: after any mix of intakes, moves,
 * scraps, undos and refused moves they must equal a recount from the units and their history.
 */
import fc from 'fast-check';
import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import type { ActionName } from '../../src/lib/domain/units/actions';
import type { Db } from '../../src/lib/server/db/index';
import { applyMove } from '../../src/lib/server/units';
import { undoLastMove } from '../../src/lib/server/undo';
import { testShop } from '../helpers/db';

/** What the tallies should hold, counted the slow way from `unit` and `unit_event`. */
function recount(db: Db) {
	const tally = db.all<{ lot: number; model: number; received: number; waiting: number; scrapped: number; minutes: number }>(sql`
		select u.lot_id lot, u.model_id model, count(*) received,
			sum(u.state in ('received', 'inspected')) waiting,
			sum(u.state = 'scrapped') scrapped,
			coalesce(sum(case when u.state = 'scrapped' then (
				select coalesce(sum(case when json_type(e.data, '$.labourMinutes') in ('integer', 'real') and json_extract(e.data, '$.labourMinutes') > 0 then json_extract(e.data, '$.labourMinutes') else 0 end), 0)
				from unit_event e where e.unit_id = u.id and e.action in ('inspect', 'accept', 'scrap')) else 0 end), 0) minutes
		from unit u group by u.lot_id, u.model_id order by 1, 2`);
	const reasons = db.all<{ lot: number; model: number; code: string; units: number }>(sql`
		select u.lot_id lot, u.model_id model,
			coalesce(case when json_type(e.data, '$.reasonCode') = 'text' then json_extract(e.data, '$.reasonCode') end, '(none)') code, count(*) units
		from unit u join unit_event e on e.id = (select max(id) from unit_event where unit_id = u.id and action = 'scrap')
		where u.state = 'scrapped' group by 1, 2, 3 order by 1, 2, 3`);
	const states = db.all(sql`select state, count(*) units from unit group by state order by state`);
	const lastStation = db.all(sql`select u.id, (select e.station_id from unit_event e where e.unit_id = u.id order by e.seq desc limit 1) station from unit u order by u.id`);
	return { tally, reasons, states, lastStation };
}

function stored(db: Db) {
	return {
		tally: db.all<{ lot: number; model: number; received: number; waiting: number; scrapped: number; minutes: number }>(sql`select lot_id lot, model_id model, received, waiting, scrapped, scrap_labour_minutes minutes from lot_tally where received > 0 order by 1, 2`),
		reasons: db.all(sql`select lot_id lot, model_id model, reason_code code, units from lot_scrap_reason_tally where units > 0 order by 1, 2, 3`),
		states: db.all(sql`select state, units from state_tally where units > 0 order by state`),
		lastStation: db.all(sql`select id, last_station_id station from unit order by id`)
	};
}

const MOVES: ActionName[] = ['inspect', 'inspect', 'inspect', 'accept', 'scrap', 'scrap', 'clean', 'hold', 'release'];

describe('lot tallies', () => {
	it('equal a recount after random intakes, moves, scraps and undos', () => {
		let scrappedSeen = 0;
		fc.assert(
			fc.property(
				fc.array(
					fc.record({
						op: fc.constantFrom('receive', 'move', 'move', 'move', 'move', 'move', 'undo'),
						unit: fc.nat({ max: 3 }),
						action: fc.constantFrom(...MOVES),
						labour: fc.oneof(fc.constant(undefined), fc.integer({ min: -5, max: 60 }), fc.constant(7.5), fc.constant('15')),
						reason: fc.constantFrom('TH-CRACK', 'BORE')
					}),
					{ minLength: 1, maxLength: 40 }
				),
				(ops) => {
					const shop = testShop();
					const serials: string[] = shop.receive(1);
					let n = 0;
					const key = () => `tally-${++n}`;
					for (const o of ops) {
						if (o.op === 'receive') {
							serials.push(...shop.receive(1));
							continue;
						}
						const serial = serials[o.unit % serials.length];
						if (o.op === 'undo') {
							undoLastMove(shop.db, shop.actors.lead, { serial, idempotencyKey: key() });
							continue;
						}
						const data: Record<string, unknown> = {};
						if (o.labour !== undefined && ['inspect', 'accept', 'scrap'].includes(o.action)) data.labourMinutes = o.labour;
						if (o.action === 'scrap') data.reasonCode = o.reason;
						if (o.action === 'hold') data.reason = 'waiting on a part';
						const at = o.unit % 2 ? { stationCode: 'TEARDOWN-1' } : {};
						const first = applyMove(shop.db, shop.actors.lead, { serial, action: o.action, idempotencyKey: key(), data, ...at });
						// a labour value a move does not take (negative, fractional, text) is refused; the move is then sent without it
						if (!first.ok && first.code === 'invalid' && 'labourMinutes' in data) {
							delete data.labourMinutes;
							applyMove(shop.db, shop.actors.lead, { serial, action: o.action, idempotencyKey: key(), data, ...at });
						}
					}
					const now = stored(shop.db);
					expect(now).toEqual(recount(shop.db));
					scrappedSeen += now.tally.reduce((sum, t) => sum + t.scrapped, 0);
					shop.db.$client.close();
				}
			),
			{ numRuns: 80 }
		);
		expect(scrappedSeen).toBeGreaterThan(2); // the runs do reach scrap (about 18 scrapped units in 80 runs)
	});

	it('count the labour of an undone verdict and follow the unit into scrap', () => {
		// Source: the rules of the scrap report — labour on inspect / accept / scrap entries counts once the unit is scrapped.
		const shop = testShop();
		const [s] = shop.receive(1);
		const at = { stationCode: 'TEARDOWN-1' };
		const ok = (r: { ok: boolean }) => expect(r.ok).toBe(true);
		ok(applyMove(shop.db, shop.actors.tech, { serial: s, ...at, action: 'inspect', idempotencyKey: 'k-inspect', data: { labourMinutes: 25 } }));
		ok(applyMove(shop.db, shop.actors.tech, { serial: s, ...at, action: 'accept', idempotencyKey: 'k-accept', data: { labourMinutes: 5 } }));
		expect(stored(shop.db).tally).toEqual([{ lot: shop.lotId, model: shop.modelId, received: 1, waiting: 0, scrapped: 0, minutes: 0 }]);
		expect(stored(shop.db).states).toEqual([{ state: 'accepted', units: 1 }]);
		ok(undoLastMove(shop.db, shop.actors.tech, { serial: s, idempotencyKey: 'k-undo' }));
		expect(stored(shop.db).tally).toEqual([{ lot: shop.lotId, model: shop.modelId, received: 1, waiting: 1, scrapped: 0, minutes: 0 }]);
		ok(applyMove(shop.db, shop.actors.tech, { serial: s, ...at, action: 'scrap', idempotencyKey: 'k-scrap', data: { reasonCode: 'BORE', labourMinutes: 3 } }));
		expect(stored(shop.db)).toMatchObject({
			tally: [{ lot: shop.lotId, model: shop.modelId, received: 1, waiting: 0, scrapped: 1, minutes: 33 }],
			reasons: [{ lot: shop.lotId, model: shop.modelId, code: 'BORE', units: 1 }],
			states: [{ state: 'scrapped', units: 1 }]
		});
		expect(stored(shop.db)).toEqual(recount(shop.db));
	});
});
