/**
 * How long a unit spent in each state, from its history, and whether a unit has waited at a
 * station past that station's threshold. Pure arithmetic on instants (milliseconds).
 */
import { list, nonNegative, timeOf } from '../numbers';
import type { UnitState } from './states';

export interface TimedEntry {
	toState: UnitState;
	fromState: UnitState | null;
	at: string | Date;
}

export interface StateSpan {
	state: UnitState;
	ms: number;
	/** Still in this state now. */
	current: boolean;
}

/** Total time per state, in the order the unit first reached each; `now` ends the last span. */
export function timeInStates(history: readonly TimedEntry[], now: Date): StateSpan[] {
	const nowMs = timeOf('Now', now);
	const totals = new Map<UnitState, number>();
	const times = list<TimedEntry>('The history', history).map((e, i) => timeOf(`The time of entry ${i + 1}`, e?.at));
	for (let i = 0; i < history.length; i++) {
		const start = times[i];
		const end = i + 1 < history.length ? times[i + 1] : nowMs;
		const s = history[i].toState;
		totals.set(s, (totals.get(s) ?? 0) + Math.max(0, end - start));
	}
	const last = history[history.length - 1]?.toState;
	return [...totals].map(([state, ms]) => ({ state, ms, current: state === last }));
}

export const HOUR_MS = 3_600_000;

export function ageMs(since: string | Date, now: Date): number {
	return Math.max(0, timeOf('Now', now) - timeOf('The start of the wait', since));
}

/** Overdue once the wait is strictly longer than the station's threshold in hours. */
export function isOverdue(since: string | Date, now: Date, overdueHours: number): boolean {
	nonNegative('The overdue threshold in hours', overdueHours);
	return ageMs(since, now) > overdueHours * HOUR_MS;
}

/** A short duration for the floor: minutes under an hour, hours under two days, then days. */
export function formatDuration(ms: number): string {
	if (typeof ms !== 'number' || !Number.isFinite(ms) || ms < 0) return '—';
	const hours = ms / HOUR_MS;
	if (hours < 1) return `${Math.max(1, Math.round(ms / 60_000))} min`;
	if (hours < 48) return `${Math.round(hours)} h`;
	return `${Math.round(hours / 24)} d`;
}
