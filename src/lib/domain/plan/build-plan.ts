/**
 * This week's build suggestion for one model.
 *
 * - Demand for the week: the greater of the forecast and the open orders already due by the
 *   week's end (overdue and undated ones count as due now). Taking the greater of forecast and
 *   booked orders is the usual "forecast consumption" of master scheduling (common practice).
 * - Work in progress counts as *equivalent finished units*: each unit weighs the share of the
 *   route it has done (received 0, inspected 1/8, … balanced 7/8). This is the equivalent-units
 *   idea of process costing (units × percentage of completion; common practice). A packed
 *   unit is finished stock, not WIP.
 * - Suggested build = demand − finished stock − equivalent WIP, rounded up (a part unit cannot
 *   be built), never below zero.
 */
import { list, nonNegative, nonNegativeInt, result } from '../numbers';
import { FLOW, type UnitState } from '../units/states';
import { ses, type SesResult } from './ses';

const PACKED = FLOW.indexOf('packed');

/** Share of the route done, for a unit in `state` (0 for states off the good route). */
export function completion(state: UnitState): number {
	const i = FLOW.indexOf(state);
	if (i < 0) return 0;
	return Math.min(1, i / PACKED);
}

/** WIP states: on the route, before packed. */
export const WIP_STATES: readonly UnitState[] = FLOW.slice(0, PACKED);

export function equivalentUnits(wip: readonly { state: UnitState; count: number }[]): number {
	let sum = 0;
	for (const w of list<{ state: UnitState; count: number }>('The work in progress', wip)) {
		nonNegativeInt(`Units in ${String(w?.state)}`, w?.count);
		if (WIP_STATES.includes(w.state)) sum += w.count * completion(w.state);
	}
	return result('The equivalent units', sum);
}

/** Demand per week: order quantities summed into the week each order was placed. */
export function weeklyDemand(weekStarts: readonly string[], lines: readonly { week: string; quantity: number }[]): number[] {
	const at = new Map(weekStarts.map((w, i) => [w, i]));
	const out = weekStarts.map(() => 0);
	for (const l of list<{ week: string; quantity: number }>('The order lines', lines)) {
		nonNegative(`The quantity ordered in the week of ${String(l?.week)}`, l?.quantity);
		const i = at.get(l.week);
		if (i !== undefined) out[i] = result('The weekly demand', out[i] + l.quantity);
	}
	return out;
}

export interface PlanInput {
	/** Units ordered per past full week, oldest first. */
	history: readonly number[];
	alpha: number;
	/** Packed units of this model not yet shipped. */
	finished: number;
	wip: readonly { state: UnitState; count: number }[];
	/** Open-order units due by the end of this week (overdue and undated included). */
	openDue: number;
}

export interface PlanResult {
	fit: SesResult;
	/** This week's forecast (0 when there is no history). */
	forecast: number;
	demand: number;
	equivalentWip: number;
	available: number;
	suggested: number;
}

const EPS = 1e-9;

export function planModel(input: PlanInput): PlanResult {
	if (typeof input !== 'object' || input === null) throw new RangeError('The plan needs its figures.');
	list<number>('The order history', input.history).forEach((y, i) => nonNegative(`Units ordered in week ${i + 1}`, y));
	nonNegative('Finished stock', input.finished);
	nonNegative('Open orders due', input.openDue);
	const fit = ses(input.history, input.alpha);
	const forecast = fit.next ?? 0;
	const demand = Math.max(forecast, input.openDue);
	const equivalentWip = equivalentUnits(input.wip);
	const available = result('The units available', input.finished + equivalentWip);
	const suggested = Math.max(0, Math.ceil(demand - available - EPS));
	return { fit, forecast, demand, equivalentWip, available, suggested };
}
