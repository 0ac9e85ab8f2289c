import { describe, expect, test } from 'vitest';
import { compareQueryFromUrl, driftQueryFromUrl, skidQueryFromUrl } from '../../src/lib/server/reports/decision-query';
import { checkAccess } from '../../src/lib/server/access';

const u = (q: string) => new URL(`http://127.0.0.1/x?${q}`);

describe('the decision reports read their queries with a sentence for each mistake', () => {
	test('compare two: different ones, from the list', () => {
		expect(compareQueryFromUrl(u('kind=supplier&a=1&b=2')).q.success).toBe(true);
		const same = compareQueryFromUrl(u('kind=supplier&a=1&b=1')).q;
		expect(same.success ? null : same.error.issues[0].message).toBe('Choose two different ones to compare.');
		const bad = compareQueryFromUrl(u('kind=planet&a=1&b=2')).q;
		expect(bad.success ? null : bad.error.issues[0].message).toBe('Compare by supplier, lot, model or source.');
		const odd = compareQueryFromUrl(u("kind=lot&a=1;drop&b=2")).q;
		expect(odd.success ? null : odd.error.issues[0].message).toBe('Choose from the list.');
	});

	test('the skid: price in dollars and cents, whole cores', () => {
		const ok = skidQueryFromUrl(u('supplier=3&cores=40&price=32.5'));
		expect(ok.success ? ok.data : null).toEqual({ supplier: 3, cores: 40, price: 3250 });
		const price = skidQueryFromUrl(u('supplier=3&cores=40&price=-4'));
		expect(price.success ? null : price.error.issues[0].message).toBe('The price per core is dollars and cents, e.g. 32.50.');
		const cores = skidQueryFromUrl(u('supplier=3&cores=2.5&price=30'));
		expect(cores.success ? null : cores.error.issues[0].message).toBe('The number of cores is a whole number.');
		const none = skidQueryFromUrl(u('supplier=3&cores=0&price=30'));
		expect(none.success ? null : none.error.issues[0].message).toBe('A skid needs at least one core.');
		const missing = skidQueryFromUrl(u('supplier=3&cores=10'));
		expect(missing.success).toBe(false);
	});

	test('drift: how many units', () => {
		const bad = driftQueryFromUrl(u('last=1'));
		expect(bad.success ? null : bad.error.issues[0].message).toBe('Units shown: a whole number from 2 to 500.');
		expect(driftQueryFromUrl(u('last=60&station=BALANCE')).success).toBe(true);
	});

	test('who may reach them: buying is the owner\'s, drift the owner\'s and the lead\'s', () => {
		for (const r of ['/api/reports/buying/compare', '/api/reports/buying/cost', '/api/reports/buying/skid']) {
			expect(checkAccess(r, 'GET', 'owner')).toBe('allow');
			expect(checkAccess(r, 'GET', 'lead')).toBe('forbidden');
			expect(checkAccess(r, 'GET', null)).toBe('sign-in');
		}
		for (const r of ['/api/reports/balance', '/(app)/reports/balance']) {
			expect(checkAccess(r, 'GET', 'lead')).toBe('allow');
			expect(checkAccess(r, 'GET', 'owner')).toBe('allow');
			expect(checkAccess(r, 'GET', 'tech')).toBe('forbidden');
			expect(checkAccess(r, 'GET', 'office')).toBe('forbidden');
		}
	});
});
