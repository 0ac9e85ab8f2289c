/**
 * The order of a station's queue.
 *
 * A unit is "on" the open card of best rank that takes it in: a units card listing it, or a
 * rule card whose every set part (model, stage, lot) matches it. Queues sort by that card's
 * rank (1 first), then the card's due date (earlier first, none last), then the unit's age
 * (longest waiting first); a unit on no card comes after every carded unit. The unit id
 * breaks the last ties, so the order is total and stable.
 *
 * `stationQueue()` in src/lib/server/stations.ts does the same in SQL; a test checks the two agree.
 */
import type { Stage } from './units/states';

export interface CardForOrder {
	id: number;
	rank: number;
	dueOn: string | null;
	open: boolean;
	kind: 'units' | 'rule';
	ruleModelId: number | null;
	ruleStage: Stage | null;
	ruleLotId: number | null;
}

export interface UnitForOrder {
	id: number;
	modelId: number;
	lotId: number;
	/** The card id of the units card listing it, if any. */
	setCardId: number | null;
	/** When the unit started waiting, ms since the epoch. */
	since: number;
}

/** Does a card take this unit in, in the queue of `stage`? */
export function cardTakes(card: CardForOrder, u: UnitForOrder, stage: Stage | null): boolean {
	if (!card.open) return false;
	if (card.kind === 'units') return u.setCardId === card.id;
	if (card.ruleModelId === null && card.ruleStage === null && card.ruleLotId === null) return false;
	return (
		(card.ruleModelId === null || card.ruleModelId === u.modelId) &&
		(card.ruleStage === null || card.ruleStage === stage) &&
		(card.ruleLotId === null || card.ruleLotId === u.lotId)
	);
}

/** Compare two cards by board position: rank, then due date (none last), then id. */
export function compareCards(a: Pick<CardForOrder, 'id' | 'rank' | 'dueOn'>, b: Pick<CardForOrder, 'id' | 'rank' | 'dueOn'>): number {
	if (a.rank !== b.rank) return a.rank - b.rank;
	if (a.dueOn !== b.dueOn) {
		if (a.dueOn === null) return 1;
		if (b.dueOn === null) return -1;
		return a.dueOn < b.dueOn ? -1 : 1;
	}
	return a.id - b.id;
}

/** The card a unit is on in the queue of `stage`, or null. */
export function cardOf<C extends CardForOrder>(cards: readonly C[], u: UnitForOrder, stage: Stage | null): C | null {
	let best: C | null = null;
	for (const c of cards) if (cardTakes(c, u, stage) && (!best || compareCards(c, best) < 0)) best = c;
	return best;
}

/** Compare two queue entries, each with the card it is on (or null). */
export function compareQueueEntries(
	a: { card: Pick<CardForOrder, 'id' | 'rank' | 'dueOn'> | null; unit: Pick<UnitForOrder, 'id' | 'since'> },
	b: { card: Pick<CardForOrder, 'id' | 'rank' | 'dueOn'> | null; unit: Pick<UnitForOrder, 'id' | 'since'> }
): number {
	if (a.card && !b.card) return -1;
	if (!a.card && b.card) return 1;
	if (a.card && b.card) {
		const c = compareCards(a.card, b.card);
		if (c !== 0) return c;
	}
	if (a.unit.since !== b.unit.since) return a.unit.since - b.unit.since;
	return a.unit.id - b.unit.id;
}

/** A station queue in order, with each unit's card. */
export function orderQueue<C extends CardForOrder, U extends UnitForOrder>(
	cards: readonly C[],
	units: readonly U[],
	stage: Stage | null
): { unit: U; card: C | null }[] {
	return units.map((unit) => ({ unit, card: cardOf(cards, unit, stage) })).sort(compareQueueEntries);
}

/** Ranks 1..n for cards in the order given (what a drag and drop leaves on the board). */
export function ranksFor(ids: readonly number[]): Map<number, number> {
	return new Map(ids.map((id, i) => [id, i + 1]));
}
