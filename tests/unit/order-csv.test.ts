import { describe, expect, test } from 'vitest';
import { checkMapping, checkOrderRows, guessMapping, parseCsv } from '../../src/lib/domain/orders/order-csv';
import { parseChannel } from '../../src/lib/domain/orders/channels';

const ctx = { modelCodes: ['CH-F46', 'CH-V55'], existingRefs: new Set(['PD-100']), today: '2026-12-01' };

describe('order files', () => {
	test('parses quoted fields (RFC 4180 quoting) and guesses the mapping from the header', () => {
		const csv = 'Order No,Depot,Part,Qty,Due Date,Comments\nND-1,North,CH-F46,2,2026-12-10,"rush, please"\n';
		const p = parseCsv(csv);
		expect(p.problems).toEqual([]);
		expect(p.rows[0].Comments).toBe('rush, please');
		const m = guessMapping(p.headers);
		expect(m).toEqual({ ref: 'Order No', channel: 'Depot', model: 'Part', quantity: 'Qty', dueOn: 'Due Date', notes: 'Comments' });
		expect(checkMapping(m, p.headers)).toEqual([]);
	});

	test('a mapping without a required field or with a column used twice is refused', () => {
		expect(checkMapping({ ref: 'a', channel: 'a', model: 'b' }, ['a', 'b'])).toEqual([
			'Column "a" is chosen for both order reference and channel.',
			'Choose the column that holds the quantity.'
		]);
	});

	test('rows with the same reference become one order; bad rows are listed with their reasons', () => {
		const csv = [
			'ref,channel,model,qty,due',
			'ND-1,North Depot,CH-F46,2,2026-12-10',
			'ND-1,north,ch-v55,1,2026-12-10',
			'ND-1,north,CH-F46,3,2026-12-10',
			'PD-100,Plains,CH-F46,1,',
			'W-7,Moon base,CH-X99,two,12/10/2026',
			'ND-1,web,CH-F46,1,2026-12-10',
			'W-8,Web,CH-F46,1,2026-11-01'
		].join('\n');
		const p = parseCsv(csv);
		const r = checkOrderRows(p.rows, guessMapping(p.headers), ctx);
		expect(r.orders).toHaveLength(1);
		expect(r.orders[0]).toMatchObject({ ref: 'ND-1', channel: 'north', dueOn: '2026-12-10', rows: [2, 3, 4] });
		expect(r.orders[0].lines).toEqual([{ model: 'CH-F46', quantity: 5 }, { model: 'CH-V55', quantity: 1 }]);
		expect(r.bad.map((b) => b.row)).toEqual([5, 6, 7, 8]);
		expect(r.bad[0].reasons).toEqual(['Order PD-100 is already in Spoolyard.']);
		expect(r.bad[1].reasons).toEqual([
			'"Moon base" is not a channel; use a depot (North, Lakes, Plains, Coast), Web or Walk-in.',
			'"CH-X99" is not one of the shop\'s models.',
			'"two" is not a whole number of units above zero.',
			'Due date "12/10/2026" is not a date written YYYY-MM-DD.'
		]);
		expect(r.bad[2].reasons[0]).toBe('Order ND-1 has channel North Depot on row 2 but Web here; one order has one channel.');
		expect(r.bad[3].reasons).toEqual(['The due date 2026-11-01 is before the order date 2026-12-01.']);
	});

	test('an empty file and a header-only file say what is wrong', () => {
		expect(parseCsv('').problems).toEqual(['The file is empty.']);
		expect(parseCsv('a,a\n1,2').problems[0]).toContain('Two columns are both called "a"');
	});

	test('channels are read as people write them', () => {
		expect(parseChannel('Coast Depot')).toBe('coast');
		expect(parseChannel('walk-in')).toBe('walk_in');
		expect(parseChannel('Customer rebuild')).toBe('walk_in');
		expect(parseChannel('WEB')).toBe('web');
		expect(parseChannel('Harbour')).toBeNull();
	});
});
