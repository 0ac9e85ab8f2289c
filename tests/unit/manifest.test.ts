import { describe, expect, test } from 'vitest';
import { applyColumnMap } from '../../src/lib/domain/import/map-columns';
import { parseCsvTable } from '../../src/lib/domain/import/csv-table';
import { MAX_TAG_LENGTH, checkManifest, modelKey, tagKey, unitProblem } from '../../src/lib/domain/lots/manifest';
import { LOT_SOURCE_KEYS, formatCents, isCalendarDate, lotFormSchema, nextLotCode, parseMoneyToCents } from '../../src/lib/domain/lots/lot';
import { LOT_SOURCES } from '../../src/lib/server/db/schema';

const models = [
	{ id: 1, code: 'CH-F46' },
	{ id: 2, code: 'CH-V55' }
];

function check(csv: string, tagsInLot = new Map<string, string>()) {
	const t = parseCsvTable(csv);
	if (!t.ok) throw new Error(t.message);
	return checkManifest(applyColumnMap(t.value, { originalTag: 0, model: 1, notes: 2 }), { models, tagsInLot });
}

describe('manifest rows', () => {
	test('good rows carry the model id; model codes match whatever the case and dashes', () => {
		const r = check('Tag,Model,Notes\nAX-1,ch f46,oily\nAX-2,CHV55,\n');
		expect(r.bad).toEqual([]);
		expect(r.good.map((g) => [g.rowNumber, g.modelId, g.modelCode])).toEqual([
			[2, 1, 'CH-F46'],
			[3, 2, 'CH-V55']
		]);
		expect(modelKey('ch-f46')).toBe(modelKey('CH F46'));
	});

	test('each bad row has its reason', () => {
		const long = 'X'.repeat(MAX_TAG_LENGTH + 1);
		const r = check(
			[
				'Tag,Model,Notes',
				'AX-1,CH-F46,',
				'AX-2,CH-Z99,',
				',,',
				'AX-3,,',
				`${long},CH-F46,`,
				'ax-1 ,CH-V55,again',
				'AX-9,CH-F46,in lot',
				'AX-4,CH-F46,a,stray'
			].join('\n'),
			new Map([[tagKey('AX-9'), 'SY-00042']])
		);
		expect(r.good.map((g) => g.rowNumber)).toEqual([2]);
		expect(r.bad.map((b) => [b.rowNumber, b.reason])).toEqual([
			[3, 'Unknown model "CH-Z99".'],
			[4, 'Empty row.'],
			[5, 'No model given.'],
			[6, `Tag too long (${MAX_TAG_LENGTH + 1} characters; at most ${MAX_TAG_LENGTH}).`],
			[7, 'Duplicate tag: ax-1 is also on row 2.'],
			[8, 'Tag AX-9 is already in this lot (SY-00042).'],
			[9, 'More cells than the header has columns (a comma inside a value without quotes?).']
		]);
	});

	test('rows without a tag are fine and never duplicates of each other', () => {
		const r = check('Tag,Model,Notes\n,CH-F46,no tag\n,CH-F46,no tag either\n');
		expect(r.good).toHaveLength(2);
	});

	test('the add-one form gets the same checks', () => {
		expect(unitProblem({ model: 'CH-F46', originalTag: 'QT-1', notes: '' }, { models, tagsInLot: new Map([['QT-1', 'SY-00001']]) })).toEqual({
			field: 'originalTag',
			reason: 'Tag QT-1 is already in this lot (SY-00001).'
		});
		expect(unitProblem({ model: 'CH-F46', originalTag: 'QT-2', notes: '' }, { models, tagsInLot: new Map() })).toEqual({ model: models[0] });
	});
});

describe('lot form', () => {
	test('the domain knows the same sources as the table', () => {
		expect([...LOT_SOURCE_KEYS]).toEqual([...LOT_SOURCES]);
	});

	test('money to cents without floating point (ISO 4217 currencies with minor unit 2)', () => {
		expect(parseMoneyToCents('45')).toBe(4500);
		expect(parseMoneyToCents('45.5')).toBe(4550);
		expect(parseMoneyToCents('0.29')).toBe(29); // 0.29 * 100 is 28.999999999999996 in IEEE 754 doubles
		expect(parseMoneyToCents(' 1 234.05 ')).toBe(123405);
		expect(parseMoneyToCents('-1')).toBeNull();
		expect(parseMoneyToCents('4,50')).toBeNull();
		expect(parseMoneyToCents('1.234')).toBeNull();
		expect(formatCents(123405)).toBe('1,234.05');
		expect(formatCents(0)).toBe('0.00');
	});

	test('calendar dates (ISO 8601 calendar dates; 2028 is a leap year, 2026 is not)', () => {
		expect(isCalendarDate('2028-02-29')).toBe(true);
		expect(isCalendarDate('2026-02-29')).toBe(false);
		expect(isCalendarDate('2026-13-01')).toBe(false);
		expect(isCalendarDate('26-12-01')).toBe(false);
	});

	test('field errors say what to fix', () => {
		const schema = lotFormSchema('2026-12-01');
		const bad = schema.safeParse({ supplierId: '', source: 'purchased_skid', receivedOn: '2026-12-05', costPerCore: 'abc', expectedCount: -1, notes: '' });
		expect(bad.success).toBe(false);
		const byField = Object.fromEntries((bad.error?.issues ?? []).map((i) => [i.path.join('.'), i.message]));
		expect(byField).toMatchObject({
			supplierId: 'A purchased skid needs its supplier.',
			receivedOn: 'The received date is in the future.',
			costPerCore: expect.stringContaining('price per core'),
			expectedCount: 'The count cannot be negative.'
		});
		const ok = schema.safeParse({ supplierId: '', source: 'customer_return', receivedOn: '2026-12-02', costPerCore: '0', expectedCount: 4, notes: '' });
		expect(ok.success).toBe(true);
	});

	test('lot codes: L, the received date as YYMMDD, and the next running number (the shop’s own format)', () => {
		expect(nextLotCode('2026-12-01', ['L260922-01', 'L261201-15', 'other'])).toBe('L261201-16');
		expect(nextLotCode('2027-01-05', [])).toBe('L270105-01');
	});
});
