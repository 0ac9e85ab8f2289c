/**
 * A rebuild quote's money, all in integer cents. Parts and labour lines are taxed at the
 * shop's rate; a core charge (positive) or core credit (negative) is added untaxed.
 * Whether a core charge is taxable differs by place: set it up per local rules (common practice).
 */
import { list, nonNegativeInt, safeInt } from '../numbers';

export interface QuoteLineInput {
	kind: 'part' | 'labour';
	description: string;
	/** Quantity in hundredths: 125 = 1.25 (hours of labour, or parts). */
	quantityHundredths: number;
	unitPriceCents: number;
}

export interface QuoteTotals {
	lines: { lineCents: number }[];
	partsCents: number;
	labourCents: number;
	subtotalCents: number;
	taxCents: number;
	coreCents: number;
	totalCents: number;
}

/** Round half away from zero, for a value in cents given as numerator/denominator (integers). */
export function roundDiv(numerator: number, denominator: number): number {
	if (!Number.isSafeInteger(numerator)) throw new RangeError(`The amount is too large to work out in whole cents (got ${numerator}).`);
	safeInt('The divisor', denominator);
	if (denominator <= 0) throw new RangeError(`The divisor must be more than 0 (got ${denominator}).`);
	const sign = numerator < 0 ? -1 : 1;
	const n = Math.abs(numerator);
	const q = Math.floor(n / denominator);
	const r = n - q * denominator;
	return sign * (2 * r >= denominator ? q + 1 : q);
}

/** One line's amount: quantity × unit price, rounded to the cent. */
export function lineCents(line: Pick<QuoteLineInput, 'quantityHundredths' | 'unitPriceCents'>): number {
	if (typeof line !== 'object' || line === null) throw new RangeError('A quote line needs its quantity and price.');
	nonNegativeInt('The quantity (in hundredths)', line.quantityHundredths);
	safeInt('The unit price in cents', line.unitPriceCents);
	return roundDiv(line.quantityHundredths * line.unitPriceCents, 100);
}

/** Tax on `amountCents` at `rateBp` basis points (1 bp = 0.01 %), rounded half up to the cent. */
export function taxCents(amountCents: number, rateBp: number): number {
	safeInt('The taxable amount in cents', amountCents);
	nonNegativeInt('The tax rate in basis points', rateBp);
	return roundDiv(amountCents * rateBp, 10_000);
}

export function quoteTotals(lines: readonly QuoteLineInput[], taxRateBp: number, coreCents = 0): QuoteTotals {
	nonNegativeInt('The tax rate in basis points', taxRateBp);
	safeInt('The core charge in cents', coreCents);
	const priced = list<QuoteLineInput>('The quote lines', lines).map((l) => ({ lineCents: lineCents(l), kind: l.kind }));
	const partsCents = priced.filter((l) => l.kind === 'part').reduce((a, l) => a + l.lineCents, 0);
	const labourCents = priced.filter((l) => l.kind === 'labour').reduce((a, l) => a + l.lineCents, 0);
	const subtotalCents = partsCents + labourCents;
	const tax = taxCents(subtotalCents, taxRateBp);
	const totalCents = subtotalCents + tax + coreCents;
	for (const [what, v] of [['parts total', partsCents], ['labour total', labourCents], ['total', totalCents]] as const) {
		if (!Number.isSafeInteger(v)) throw new RangeError(`The quote's ${what} is too large to work out in whole cents.`);
	}
	return {
		lines: priced.map((l) => ({ lineCents: l.lineCents })),
		partsCents,
		labourCents,
		subtotalCents,
		taxCents: tax,
		coreCents,
		totalCents
	};
}

/** "1234.5" or "1,234.50" → 123450 cents; null when it is not an amount. */
export function parseMoney(text: string): number | null {
	const t = text.trim().replace(/,/g, '');
	const m = /^(-)?(\d{1,9})(?:\.(\d{1,2}))?$/.exec(t);
	if (!m) return null;
	const cents = Number(m[2]) * 100 + Number((m[3] ?? '').padEnd(2, '0'));
	return m[1] ? -cents : cents;
}

/** "1.25" → 125 hundredths; null when it is not a positive quantity with at most two decimals. */
export function parseQuantity(text: string): number | null {
	const m = /^(\d{1,6})(?:\.(\d{1,2}))?$/.exec(text.trim());
	if (!m) return null;
	const q = Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
	return q > 0 ? q : null;
}

/** An amount in cents for people; '—' for a value that is not a number. */
export function formatMoney(cents: number, currency = 'USD'): string {
	if (typeof cents !== 'number' || !Number.isFinite(cents)) return '—';
	const sign = cents < 0 ? '−' : '';
	const abs = Math.abs(Math.round(cents));
	const whole = Math.floor(abs / 100).toLocaleString('en-US');
	return `${sign}${currency === 'USD' ? '$' : `${currency} `}${whole}.${String(abs % 100).padStart(2, '0')}`;
}

export function formatQuantity(hundredths: number): string {
	if (typeof hundredths !== 'number' || !Number.isFinite(hundredths)) return '—';
	return hundredths % 100 === 0 ? String(hundredths / 100) : (hundredths / 100).toFixed(2).replace(/0$/, '');
}
