import { describe, expect, it } from 'vitest';
import { judgeLots, lotAboveShop, type LotCounts } from '../../src/lib/domain/warranty/parts-lots';

const lot = (lotCode: string, shipped: number, returned: number): LotCounts => ({ kind: 'bearing_kit', lot: lotCode, built: shipped, shipped, returned, modes: [] });

describe('parts lots against the shop’s return rate', () => {
	// Wilson 95 % limits from Newcombe RG (1998), Statistics in Medicine 17:857–872, Table I:
	// 81/263 → 0.2553–0.3662 and 15/148 → 0.0624–0.1605.
	it('flags 81/263 against a shop at 25 % (lower limit 0.2553, Newcombe 1998 Table I)', () => {
		expect(lotAboveShop(81, 263, 0.25)).toBe(true);
		expect(lotAboveShop(81, 263, 0.26)).toBe(false);
	});

	it('flags 15/148 against a shop at 6 % but not at 6.5 % (lower limit 0.0624, Newcombe 1998 Table I)', () => {
		expect(lotAboveShop(15, 148, 0.06)).toBe(true);
		expect(lotAboveShop(15, 148, 0.065)).toBe(false);
	});

	it('does not flag a small lot on one return, nor a lot with nothing shipped, nor a shop without a rate', () => {
		// 1/5 is a fifth of the lot, but its Wilson lower limit is 0.0362 (score formula, Wilson 1927), below a 5 % shop.
		expect(lotAboveShop(1, 5, 0.05)).toBe(false);
		expect(lotAboveShop(2, 5, 0.03)).toBe(true);
		// 1/1 has a Wilson lower limit of 0.2065 (score formula), above a 4 % shop, but a single return is not a pattern.
		expect(lotAboveShop(1, 1, 0.04)).toBe(false);
		expect(lotAboveShop(0, 0, 0.05)).toBe(false);
		expect(lotAboveShop(3, 10, null)).toBe(false);
	});

	it('judges every lot against the shop rate, flagged lots first, with their intervals', () => {
		const { shop, lots } = judgeLots([lot('BK-A', 148, 15), lot('BK-B', 263, 81), lot('BK-C', 20, 0)], { shipped: 1000, returned: 60 });
		expect(shop.rate).toBeCloseTo(0.06, 10);
		expect(lots.map((l) => [l.lot, l.flagged])).toEqual([
			['BK-B', true],
			['BK-A', true],
			['BK-C', false]
		]);
		const b = lots[0];
		// Newcombe 1998 Table I, 81/263.
		expect(b.low).toBeCloseTo(0.2553, 4);
		expect(b.high).toBeCloseTo(0.3662, 4);
		expect(lots[2].rate).toBe(0);
	});

	it('flags nothing when the shop has shipped nothing', () => {
		const { shop, lots } = judgeLots([lot('BK-A', 0, 0)], { shipped: 0, returned: 0 });
		expect(shop.rate).toBeNull();
		expect(lots[0].flagged).toBe(false);
		expect(lots[0].low).toBeNull();
	});
});
