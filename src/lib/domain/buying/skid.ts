/**
 * The next skid, priced before buying it: N cores at a price from a source whose history gave
 * `accepted` good cores out of `judged`. Expected good cores N·p̂ with the range N·L … N·H from
 * the accept rate's Wilson interval (the range of the expected number: the skid itself varies
 * around it); the cost per good core and its range as in cost-per-good.ts; the outlay
 * N × (price + labour per core).
 */
import { costPerGood, type CostPerGood } from './cost-per-good';
import { checkAmount, checkCount } from './checks';
import { finiteResult } from '../numbers';

export interface SkidOffer {
	label: string;
	cores: number;
	priceCents: number;
	labourCents: number;
	accepted: number;
	judged: number;
}

export interface SkidQuote {
	label: string;
	cores: number;
	outlayCents: number;
	goodExpected: number | null;
	goodLow: number | null;
	goodHigh: number | null;
	cost: CostPerGood;
}

export function priceSkid(offer: SkidOffer, confidence = 0.95): SkidQuote {
	checkCount('number of cores', offer.cores);
	if (offer.cores === 0) throw new RangeError('A skid needs at least one core.');
	checkAmount('price per core', offer.priceCents);
	const cost = costPerGood(offer, confidence);
	return finiteResult('The skid', {
		label: offer.label,
		cores: offer.cores,
		outlayCents: offer.cores * (offer.priceCents + offer.labourCents),
		goodExpected: cost.acceptRate === null ? null : offer.cores * cost.acceptRate,
		goodLow: cost.acceptLow === null ? null : offer.cores * cost.acceptLow,
		goodHigh: cost.acceptHigh === null ? null : offer.cores * cost.acceptHigh,
		cost
	});
}

const dollars = (cents: number) => (cents / 100).toFixed(2);

/**
 * Two offers side by side, in words: one is cheaper per good core only when its dearest end is
 * below the other's cheapest end; otherwise the ranges overlap and the history cannot tell.
 */
export function compareOffers(a: SkidQuote, b: SkidQuote): string {
	const ca = a.cost;
	const cb = b.cost;
	if (ca.cents === null || cb.cents === null) {
		const none = ca.cents === null ? a.label : b.label;
		return `No good core on record for ${none} yet: its cost per good core cannot be worked out.`;
	}
	if (ca.highCents !== null && cb.lowCents !== null && ca.highCents < cb.lowCents)
		return `${a.label} is cheaper per good core: at most ${dollars(ca.highCents)} against at least ${dollars(cb.lowCents)} for ${b.label}.`;
	if (cb.highCents !== null && ca.lowCents !== null && cb.highCents < ca.lowCents)
		return `${b.label} is cheaper per good core: at most ${dollars(cb.highCents)} against at least ${dollars(ca.lowCents)} for ${a.label}.`;
	const cheaper = ca.cents <= cb.cents ? a : b;
	const other = cheaper === a ? b : a;
	return `${cheaper.label} looks cheaper per good core (${dollars(cheaper.cost.cents!)} against ${dollars(other.cost.cents!)}), but the ranges overlap: the history cannot tell them apart yet.`;
}
