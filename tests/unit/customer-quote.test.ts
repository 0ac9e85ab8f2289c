import { bignumber, multiply, divide, round } from 'mathjs';
import fc from 'fast-check';
import { expect, test } from 'vitest';
import { formatMoney, lineCents, parseMoney, parseQuantity, quoteTotals, roundDiv, taxCents } from '../../src/lib/domain/customer/quote';

test('worked example: parts, labour, tax and a core credit', () => {
	// Worked by hand:
	//   bearing and seal kit   1 × 89.50        =  89.50
	//   compressor wheel       1 × 142.00       = 142.00
	//   labour              2.50 h × 95.00      = 237.50
	//   subtotal                                 = 469.00
	//   tax 8.25 % of 469.00 = 38.6925 → 38.69 (round half up to the cent, common practice)
	//   core credit                              = −50.00 (not taxed)
	//   total 469.00 + 38.69 − 50.00             = 457.69
	const t = quoteTotals(
		[
			{ kind: 'part', description: 'Bearing and seal kit', quantityHundredths: 100, unitPriceCents: 8950 },
			{ kind: 'part', description: 'Compressor wheel', quantityHundredths: 100, unitPriceCents: 14200 },
			{ kind: 'labour', description: 'Rebuild and balance', quantityHundredths: 250, unitPriceCents: 9500 }
		],
		825,
		-5000
	);
	expect(t).toMatchObject({ partsCents: 23150, labourCents: 23750, subtotalCents: 46900, taxCents: 3869, coreCents: -5000, totalCents: 45769 });
	expect(formatMoney(t.totalCents)).toBe('$457.69');
});

test('the e2e quote: 89.50 + 2.5 h × 95.00 at 8.25 % is 353.98', () => {
	// 327.00 × 0.0825 = 26.9775 → 26.98; 327.00 + 26.98 = 353.98 (worked by hand)
	const t = quoteTotals(
		[
			{ kind: 'part', description: 'kit', quantityHundredths: 100, unitPriceCents: 8950 },
			{ kind: 'labour', description: 'labour', quantityHundredths: 250, unitPriceCents: 9500 }
		],
		825
	);
	expect(t.totalCents).toBe(35398);
});

test('line and tax rounding agree with decimal arithmetic in mathjs (BigNumber, ROUND_HALF_UP)', () => {
	// Reference: mathjs BigNumber (decimal.js underneath) with round() to 0 decimals; for
	// positive values mathjs round() is half up, which is the rule we use.
	fc.assert(
		fc.property(fc.integer({ min: 1, max: 100_000 }), fc.integer({ min: 0, max: 5_000_000 }), fc.integer({ min: 0, max: 2500 }), (q, price, bp) => {
			const refLine = Number(round(divide(multiply(bignumber(q), bignumber(price)), bignumber(100)) as never) as never);
			expect(lineCents({ quantityHundredths: q, unitPriceCents: price })).toBe(refLine);
			const refTax = Number(round(divide(multiply(bignumber(refLine), bignumber(bp)), bignumber(10000)) as never) as never);
			expect(taxCents(refLine, bp)).toBe(refTax);
		}),
		{ numRuns: 500 }
	);
});

test('roundDiv rounds halves away from zero', () => {
	expect(roundDiv(5, 10)).toBe(1);
	expect(roundDiv(4, 10)).toBe(0);
	expect(roundDiv(-5, 10)).toBe(-1);
	expect(roundDiv(15, 10)).toBe(2);
	expect(() => roundDiv(1, 0)).toThrow();
});

test('money and quantity parsing', () => {
	expect(parseMoney('1,234.5')).toBe(123450);
	expect(parseMoney('-150')).toBe(-15000);
	expect(parseMoney('12.345')).toBeNull();
	expect(parseMoney('abc')).toBeNull();
	expect(parseQuantity('2.5')).toBe(250);
	expect(parseQuantity('0')).toBeNull();
	expect(parseQuantity('-1')).toBeNull();
});
