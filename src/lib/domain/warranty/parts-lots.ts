/**
 * Warranty returns by parts lot: which bearing-kit or seal-kit lot a returned unit was built
 * from, and whether a lot comes back more often than the shop as a whole.
 *
 * What counts:
 * - A unit's parts lots are those of its **latest** assembly record (the build it shipped as).
 *   Wheels carry one serial per piece, not a lot, so they are not grouped here.
 * - **Shipped** units built from the lot are the denominator: only a shipped unit can come back.
 * - **Returned** counts shipped units that came back at least once (a warranty-return unit
 *   points at them with `return_of_unit_id`), so returned ≤ shipped.
 * - The shop's rate is returned / shipped over every shipped unit with an assembly record in the
 *   same view (same build dates and model).
 *
 * The rule (one-sided comparison against the shop): a lot is **flagged** when it has at least two
 * returns and the lower bound of the 95 % Wilson interval of its return rate lies above the shop's
 * overall return rate (one return of one shipped unit has a lower bound of 0.21, above most shops,
 * yet says nothing about the lot). A lot
 * with few shipped units has a wide interval, so a single return among a handful of units does
 * not flag it; a lot is flagged only when even the optimistic end of its interval is worse than
 * the shop. This is the
 * same reading as the scrap p-chart (a lot outside what the shop's rate explains); it is a prompt
 * to look at the lot, not proof that the parts are bad.
 */
import { atMost, fraction, list, nonNegativeInt } from '../numbers';
import { rateWithInterval } from '../stats/proportion';
import type { FailureMode } from './failure-modes';

export const PART_KINDS = ['bearing_kit', 'seal_kit'] as const;
export type PartKind = (typeof PART_KINDS)[number];
export const PART_KIND_LABEL: Record<PartKind, string> = { bearing_kit: 'Bearing kit', seal_kit: 'Seal kit' };

/** One return is an anecdote, whatever its interval says: a lot needs at least this many to be flagged. */
export const MIN_RETURNS_TO_FLAG = 2;

export const LOT_FLAG_RULE =
	'A lot is flagged when it has at least two returns and the low end of its 95 % Wilson interval is above the shop’s overall return rate.';

export interface LotCounts {
	kind: PartKind;
	lot: string;
	/** Units whose latest assembly record names the lot. */
	built: number;
	/** Of those, shipped. */
	shipped: number;
	/** Of the shipped, units that came back under warranty. */
	returned: number;
	/** Failure modes found at the teardown of the returns (one per return). */
	modes: { mode: FailureMode | 'not_recorded'; count: number }[];
}

export interface LotVerdict extends LotCounts {
	rate: number | null;
	low: number | null;
	high: number | null;
	flagged: boolean;
}

/** The rule itself: is the lot's interval wholly above the shop's rate? */
export function lotAboveShop(returned: number, shipped: number, shopRate: number | null, confidence = 0.95): boolean {
	nonNegativeInt('Returned units', returned);
	nonNegativeInt('Units shipped', shipped);
	atMost('Returned units', returned, 'Units shipped', shipped);
	if (shopRate !== null) fraction("The shop's return rate", shopRate);
	if (shopRate === null || shipped === 0 || returned < MIN_RETURNS_TO_FLAG) return false;
	const { low } = rateWithInterval(returned, shipped, confidence);
	return low !== null && low > shopRate;
}

/** The shop's overall rate and each lot with its interval and flag; flagged lots first. */
/** A lot's counts, checked: whole numbers, returned ≤ shipped ≤ built. */
export function checkLotCounts(l: LotCounts): LotCounts {
	if (typeof l !== 'object' || l === null) throw new RangeError('A parts lot needs its counts.');
	const name = `Lot ${String(l.lot)}`;
	nonNegativeInt(`${name}: units built`, l.built);
	nonNegativeInt(`${name}: units shipped`, l.shipped);
	nonNegativeInt(`${name}: units returned`, l.returned);
	atMost(`${name}: units shipped`, l.shipped, 'Units built', l.built);
	atMost(`${name}: units returned`, l.returned, 'Units shipped', l.shipped);
	return l;
}

export function judgeLots(lots: readonly LotCounts[], shop: { shipped: number; returned: number }) {
	list<LotCounts>('The parts lots', lots).forEach(checkLotCounts);
	if (typeof shop !== 'object' || shop === null) throw new RangeError("The shop's counts are missing.");
	nonNegativeInt('Units shipped by the shop', shop.shipped);
	nonNegativeInt('Units returned to the shop', shop.returned);
	atMost('Units returned to the shop', shop.returned, 'Units shipped by the shop', shop.shipped);
	const overall = rateWithInterval(shop.returned, shop.shipped);
	const judged: LotVerdict[] = lots.map((l) => {
		const r = rateWithInterval(l.returned, l.shipped);
		return { ...l, ...r, flagged: lotAboveShop(l.returned, l.shipped, overall.rate) };
	});
	judged.sort(
		(a, b) =>
			Number(b.flagged) - Number(a.flagged) ||
			(b.low ?? -1) - (a.low ?? -1) ||
			b.shipped - a.shipped ||
			a.kind.localeCompare(b.kind) ||
			a.lot.localeCompare(b.lot)
	);
	return { shop: { ...shop, ...overall }, lots: judged };
}
