/**
 * Undo: the person who made a move may take back their own last move on a unit for a short
 * while. An undo never deletes: it is a new, compensating history entry that returns the unit
 * to the state (and hold) it had before the move. Pure: no storage.
 */
import { replay, type HistoryEntry } from './machine';
import { STATE_LABEL, isTerminal, type UnitState } from './states';

/** How long after a move its maker may still undo it. */
export const UNDO_WINDOW_MS = 2 * 60_000;

export interface UndoHistoryEntry extends HistoryEntry {
	seq: number;
	userId: string | null;
	at: Date;
}

export interface UndoRequest {
	userId: string;
	/** The seq the person means to undo (what their screen showed); the last entry when absent. */
	seq?: number;
}

export type UndoDecision =
	| {
			ok: true;
			undoesSeq: number;
			undoesAction: string;
			from: UnitState;
			to: UnitState;
			held: boolean;
			holdReason: string | null;
			/** When the unit first entered `to`, so its age on the boards is told right again. */
			stateSince: Date;
	  }
	| { ok: false; message: string };

/** Decide whether `request` may undo the last entry of a unit's `history` (oldest first) at `now`. */
export function decideUndo(serial: string, history: readonly UndoHistoryEntry[], request: UndoRequest, now: Date): UndoDecision {
	const last = history[history.length - 1];
	if (!last) return { ok: false, message: `${serial} has no history to undo.` };
	if (request.seq !== undefined && request.seq !== last.seq) {
		const target = history.find((e) => e.seq === request.seq);
		if (!target) return { ok: false, message: `${serial} has no move number ${request.seq}.` };
		return { ok: false, message: `Only the last move on ${serial} can be undone; it has moved since.` };
	}
	if (last.action === 'undo') return { ok: false, message: `The last move on ${serial} is already undone.` };
	if (last.action === 'receive') return { ok: false, message: `Receiving ${serial} cannot be undone here; ask the office to correct the lot.` };
	if (isTerminal(last.toState)) {
		return {
			ok: false,
			message: `${serial} is ${STATE_LABEL[last.toState].toLowerCase()}; that cannot be undone from a station. Ask the lead to correct it.`
		};
	}
	if (last.userId !== request.userId) {
		return { ok: false, message: `Only the person who made the last move on ${serial} can undo it; ask the lead.` };
	}
	const age = now.getTime() - last.at.getTime();
	if (age > UNDO_WINDOW_MS) {
		return {
			ok: false,
			message: `The last move on ${serial} was made more than ${UNDO_WINDOW_MS / 60_000} minutes ago; ask the lead to correct it.`
		};
	}
	if (last.fromState === null) return { ok: false, message: `${serial}: the first entry cannot be undone.` };
	const before = replay(serial, history.slice(0, -1));
	// when did the unit first enter the state it returns to
	let since = history[0].at;
	for (const e of history.slice(0, -1)) if (e.toState !== e.fromState) since = e.at;
	return {
		ok: true,
		undoesSeq: last.seq,
		undoesAction: last.action,
		from: last.toState,
		to: before.state,
		held: before.held,
		holdReason: before.holdReason,
		stateSince: since
	};
}
