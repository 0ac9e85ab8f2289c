import { expect, test } from 'vitest';
import { testShop } from '../helpers/db';

test('the history cannot be rewritten by any SQL: update, delete, replace, upsert', () => {
	const shop = testShop();
	const [serial] = shop.receive();
	const c = shop.db.$client;
	const ev = c.prepare(`select e.* from unit_event e join unit u on u.id = e.unit_id where u.serial = ?`).get(serial) as Record<string, unknown>;
	const attempts = [
		`update unit_event set to_state = 'shipped' where id = ${ev.id}`,
		`delete from unit_event where id = ${ev.id}`,
		`insert or replace into unit_event (id, unit_id, seq, to_state, action, at, idempotency_key) values (${ev.id}, ${ev.unit_id}, 1, 'shipped', 'receive', 0, 'other-key')`,
		`replace into unit_event (unit_id, seq, to_state, action, at, idempotency_key) values (${ev.unit_id}, 1, 'shipped', 'receive', 0, '${ev.idempotency_key}')`,
		`insert into unit_event (unit_id, seq, to_state, action, at, idempotency_key) values (${ev.unit_id}, 1, 'shipped', 'receive', 0, 'k-upsert') on conflict do update set to_state = 'scrapped'`
	];
	for (const sql of attempts) expect(() => c.exec(sql), sql).toThrow(/append-only/);
	expect(c.prepare('select * from unit_event where id = ?').get(ev.id)).toEqual(ev);
	expect(c.prepare('select count(*) from unit_event where unit_id = ?').pluck().get(ev.unit_id)).toBe(1);
	// a plain new entry is still fine
	c.exec(`insert into unit_event (unit_id, seq, from_state, to_state, action, at, idempotency_key) values (${ev.unit_id}, 2, 'received', 'inspected', 'inspect', 0, 'k-new')`);
	expect(c.prepare('select count(*) from unit_event where unit_id = ?').pluck().get(ev.unit_id)).toBe(2);
});
