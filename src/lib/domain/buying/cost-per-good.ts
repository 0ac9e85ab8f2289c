/**
 * Cost per good core with its range. A core costs its price plus the labour spent on it before
 * the verdict (teardown and inspection); only the accepted share of them becomes good cores, so
 *   cost per good core = (price per core + labour per core) ÷ accept rate.
 * The accept rate's 95 % Wilson interval [L, H] carries over through this decreasing transform
 * (c/p falls as p rises), so the range is [c/H, c/L]; with L = 0 there is no upper end yet.
 * Sources are ranked by the upper end: the dearest a good core could plausibly be.
 */
import { wilsonInterval } from '../stats/proportion';
import { checkAmount, checkConfidence, checkProportion } from './checks';
import { finiteResult } from '../numbers';

export interface CostInput {
	/** Price paid per core, in cents. */
	priceCents: number;
	/** Labour before the verdict per core judged, in cents. */
	labourCents: number;
	accepted: number;
	judged: number;
}

export interface CostPerGood {
	/** Price plus labour per core, in cents. */
	perCoreCents: number;
	acceptRate: number | null;
	acceptLow: number | null;
	acceptHigh: number | null;
	/** Expected cost per good core; null without any accepted core. */
	cents: number | null;
	/** The cheapest end of the range. */
	lowCents: number | null;
	/** The dearest end; null when the accept rate's lower limit is 0 (no upper end yet). */
	highCents: number | null;
}

export function costPerGood(input: CostInput, confidence = 0.95): CostPerGood {
	checkAmount('price per core', input.priceCents);
	checkAmount('labour per core', input.labourCents);
	checkProportion('accepted cores', input.accepted, input.judged);
	checkConfidence(confidence);
	const c = input.priceCents + input.labourCents;
	const ci = wilsonInterval(input.accepted, input.judged, confidence);
	if (!ci) return finiteResult('The cost per good core', { perCoreCents: c, acceptRate: null, acceptLow: null, acceptHigh: null, cents: null, lowCents: null, highCents: null });
	const p = input.accepted / input.judged;
	return finiteResult('The cost per good core', {
		perCoreCents: c,
		acceptRate: p,
		acceptLow: ci.low,
		acceptHigh: ci.high,
		cents: p > 0 ? c / p : null,
		lowCents: ci.high > 0 ? c / ci.high : null,
		highCents: ci.low > 0 ? c / ci.low : null
	});
}

/** Cheapest worst case first; sources without an upper end (or any verdicts) last, then by the expected cost. */
export function rankByUpper<T extends { cost: CostPerGood }>(rows: readonly T[]): T[] {
	const key = (r: T) => r.cost.highCents ?? Number.POSITIVE_INFINITY;
	const mid = (r: T) => r.cost.cents ?? Number.POSITIVE_INFINITY;
	return [...rows].sort((a, b) => key(a) - key(b) || mid(a) - mid(b) || 0);
}
