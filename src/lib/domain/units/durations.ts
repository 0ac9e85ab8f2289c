/**
 * Time a unit spent in each state, read from its history: an event puts the unit into its
 * `toState` at `at`, and it stays there until the next event that changes the state (or now).
 * Holds and notes that do not change the state do not start a new stay.
 */
import { list, nonNegative, timeOf } from '../numbers';
import type { UnitState } from './states';

export interface HistoryPoint {
	toState: UnitState;
	at: string | number | Date;
}

export interface StateStay {
	state: UnitState;
	from: number;
	/** null while the unit is still in this state. */
	to: number | null;
	ms: number;
}


/** Each stay in order. Terminal states (shipped, scrapped) are counted up to their own event only. */
export function stateStays(history: readonly HistoryPoint[], now: number, terminal: readonly UnitState[] = ['shipped', 'scrapped']): StateStay[] {
	timeOf('Now', now);
	const stays: StateStay[] = [];
	for (const [i, e] of list<HistoryPoint>('The history', history).entries()) {
		if (typeof e !== 'object' || e === null) throw new RangeError(`Entry ${i + 1} of the history is missing.`);
		const at = timeOf(`The time of entry ${i + 1}`, e.at);
		const last = stays[stays.length - 1];
		if (last && last.state === e.toState) continue;
		if (last) {
			last.to = at;
			last.ms = Math.max(0, at - last.from);
		}
		stays.push({ state: e.toState, from: at, to: null, ms: 0 });
	}
	const last = stays[stays.length - 1];
	if (last && last.to === null) {
		if (terminal.includes(last.state)) {
			last.to = last.from;
			last.ms = 0;
		} else last.ms = Math.max(0, now - last.from);
	}
	return stays;
}

/** Total per state, in the order the unit first reached each state. */
export function timeInEachState(stays: readonly StateStay[]): { state: UnitState; ms: number; visits: number }[] {
	const out = new Map<UnitState, { state: UnitState; ms: number; visits: number }>();
	for (const s of list<StateStay>('The stays', stays)) {
		nonNegative(`The time in ${String(s?.state)}`, s?.ms);
		const t = out.get(s.state) ?? { state: s.state, ms: 0, visits: 0 };
		t.ms = t.ms + s.ms;
		if (!Number.isFinite(t.ms)) throw new RangeError(`The time in ${s.state} is too large to add up.`);
		t.visits += 1;
		out.set(s.state, t);
	}
	return [...out.values()];
}

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/** "45 min", "5.5 h", "3 d 4 h"; '—' for a value that is not a duration (not a number, or negative). */
export function formatDuration(ms: number): string {
	if (typeof ms !== 'number' || !Number.isFinite(ms) || ms < 0) return '—';
	if (ms < HOUR) return `${Math.round(ms / MINUTE)} min`;
	if (ms < 2 * DAY) return `${(Math.round((ms / HOUR) * 10) / 10).toFixed(1)} h`;
	const d = Math.floor(ms / DAY);
	const h = Math.round((ms - d * DAY) / HOUR);
	return h === 24 ? `${d + 1} d` : h ? `${d} d ${h} h` : `${d} d`;
}
