import jStat from 'jstat';
import { expect, test } from 'vitest';
import { unit, unitEvent } from '../../src/lib/server/db/schema';
import { medianTimeBetweenStates } from '../../src/lib/server/db/flow-sql';
import { readyEstimate } from '../../src/lib/server/flow-estimate';
import { customerShop } from '../helpers/customer';
import { eq } from 'drizzle-orm';

const FLOW_TO_PACKED = ['inspected', 'accepted', 'cleaned', 'machined', 'painted', 'assembled', 'balanced', 'packed'] as const;
const ACTION = { inspected: 'inspect', accepted: 'accept', cleaned: 'clean', machined: 'machine', painted: 'paint', assembled: 'assemble', balanced: 'balance', packed: 'pack' } as const;

test('the median time from a state to packed matches jStat’s median over the same units', () => {
	const shop = customerShop();
	const serials = shop.receive(9);
	const hour = 3_600_000;
	const start = Date.now() - 30 * 86_400_000;
	const expected: number[] = [];
	serials.forEach((serial, i) => {
		const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		let t = start + i * hour;
		let accepted = 0;
		const steps = i < 8 ? FLOW_TO_PACKED : FLOW_TO_PACKED.slice(0, -1); // the last unit is never packed
		steps.forEach((state, k) => {
			t += (1 + ((i * 7 + k * 3) % 11)) * hour;
			if (state === 'accepted') accepted = t;
			shop.db.insert(unitEvent).values({ unitId: u.id, seq: k + 2, fromState: k ? FLOW_TO_PACKED[k - 1] : 'received', toState: state, action: ACTION[state], at: new Date(t), idempotencyKey: `flow:${serial}:${k}` }).run();
		});
		if (i < 8) expected.push(t - accepted); // an even count, so the median is a mean of two
	});
	const got = medianTimeBetweenStates(shop.db, 'accepted', 'packed', start - 1);
	// Reference: jStat.median (jstat on npm), the middle value, or the mean of the two middle values.
	expect(got.n).toBe(8);
	expect(got.medianMs).toBe(jStat.median(expected));

	const since = new Date(Date.now() - hour);
	const est = readyEstimate(shop.db, 'accepted', since, new Date());
	expect(est).toMatchObject({ kind: 'estimate', basedOn: 8, readyOn: new Date(since.getTime() + jStat.median(expected)).toISOString().slice(0, 10) });
	expect(readyEstimate(shop.db, 'painted', since).kind).toBe('estimate');
	expect(readyEstimate(shop.db, 'packed', since).kind).toBe('ready');
	expect(medianTimeBetweenStates(shop.db, 'accepted', 'packed', Date.now()).n).toBe(0);
	expect(readyEstimate(shop.db, 'inspected', since, new Date(Date.now() + 400 * 86_400_000)).kind).toBe('unknown');
});
