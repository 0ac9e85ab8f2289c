/**
 * The expected ready date for a unit, as an estimate: the median time recent units took
 * from the unit's current state to being packed, counted from when it entered that state.
 */
import { flowIndex, type UnitState } from '../domain/units/states';
import type { DbOrTx } from './db';
import { medianTimeBetweenStates } from './db/flow-sql';

export const MIN_SAMPLES = 5;
const WINDOW_DAYS = 180;

export type ReadyEstimate =
	| { kind: 'estimate'; readyOn: string; basedOn: number; medianDays: number }
	| { kind: 'ready' | 'shipped' | 'scrapped' | 'unknown' };

export function readyEstimate(db: DbOrTx, state: UnitState, stateSince: Date, now: Date = new Date()): ReadyEstimate {
	if (state === 'shipped') return { kind: 'shipped' };
	if (state === 'scrapped') return { kind: 'scrapped' };
	if (flowIndex(state) >= flowIndex('packed')) return { kind: 'ready' };
	const { medianMs, n } = medianTimeBetweenStates(db, state, 'packed', now.getTime() - WINDOW_DAYS * 86_400_000);
	if (medianMs === null || n < MIN_SAMPLES) return { kind: 'unknown' };
	const ready = new Date(Math.max(now.getTime() + 3_600_000, stateSince.getTime() + medianMs));
	return { kind: 'estimate', readyOn: ready.toISOString().slice(0, 10), basedOn: n, medianDays: Math.round((medianMs / 86_400_000) * 10) / 10 };
}
