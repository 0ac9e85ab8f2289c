/**
 * Lists the moves a unit could be asked to make, and sorts them into the ones the state machine
 * allows and the ones it refuses. The machine itself (`decide`) does the sorting, so generators
 * built on this list follow the real route, holds, rework, scrap and the customer's paths.
 */
import { ROLES, type Role } from '../../src/lib/domain/auth/roles';
import { ACTIONS, ACTION_INFO, type ActionName } from '../../src/lib/domain/units/actions';
import { decide, type Decision } from '../../src/lib/domain/units/machine';
import type { UnitFacts, UnitSnapshot } from '../../src/lib/domain/units/guards';
import { STAGES, nextStage, type Stage, type UnitState } from '../../src/lib/domain/units/states';

/** A scrap reason code the test shops and the demo both have. */
export const SCRAP_CODE = 'TH-CRACK';

export interface MoveAsk {
	action: ActionName;
	role: Role;
	stationStage: Stage | null;
	data: Record<string, unknown>;
}

/** Data that passes each action's schema (`actionData`): hold and rework need a reason, scrap a code, rework a stage. */
export function validData(action: ActionName): Record<string, unknown>[] {
	switch (action) {
		case 'hold':
			return [{ reason: 'Waiting for a compressor wheel' }];
		case 'rework':
			return STAGES.map((toStage) => ({ toStage, reason: 'Runout over the limit on recheck' }));
		case 'scrap':
			return [{ reasonCode: SCRAP_CODE }];
		default:
			return [{}];
	}
}

/** The stage after `stage` (wrapping): always a wrong station for that stage's work. */
function otherStage(stage: Stage): Stage {
	return STAGES[(STAGES.indexOf(stage) + 1) % STAGES.length];
}

/**
 * Where each move might be asked: every role away from a station, a tech and a lead at the
 * station that does the work (or where the unit waits, for moves not tied to a stage; teardown
 * for a scrap verdict), and a tech at a wrong station. Each with valid data.
 */
export function asksFor(state: UnitState): MoveAsk[] {
	const out: MoveAsk[] = [];
	for (const action of ACTIONS) {
		if (action === 'receive') continue;
		const info = ACTION_INFO[action];
		const home = info.stage ?? nextStage(state) ?? 'ship';
		const places: [Role, Stage | null][] = ROLES.map((r) => [r, null]);
		places.push(['tech', home], ['lead', home], ['tech', otherStage(home)]);
		if (action === 'scrap' && home !== 'teardown') places.push(['tech', 'teardown']);
		for (const data of validData(action)) for (const [role, stationStage] of places) out.push({ action, role, stationStage, data });
	}
	return out;
}

/** Every action (receive too) by every role at every station and away from one, with valid data and with none. */
export function everyAsk(): MoveAsk[] {
	const out: MoveAsk[] = [];
	for (const action of ACTIONS) {
		const datas = [...validData(action), {}];
		for (const role of ROLES) for (const stationStage of [null, ...STAGES]) for (const data of datas) out.push({ action, role, stationStage, data });
	}
	return out;
}

export interface Sorted {
	allowed: { ask: MoveAsk; decision: Extract<Decision, { ok: true }> }[];
	/** Refused by the route, a hold or a guard (409 on the server). */
	refused: { ask: MoveAsk; message: string }[];
	/** Refused for the role (403) or the data (400). */
	other: { ask: MoveAsk; decision: Decision }[];
}

/** Ask the machine about each move. */
export function sortAsks(unit: UnitSnapshot, facts: UnitFacts, asks: readonly MoveAsk[]): Sorted {
	const sorted: Sorted = { allowed: [], refused: [], other: [] };
	for (const ask of asks) {
		const d = decide(unit, ask, facts);
		if (d.ok) sorted.allowed.push({ ask, decision: d });
		else if (d.kind === 'refused') sorted.refused.push({ ask, message: d.message });
		else sorted.other.push({ ask, decision: d });
	}
	return sorted;
}

/** A small deterministic random source (mulberry32), so a failing run can be replayed from its seed. */
export function rng(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** How often a generator picks each kind of allowed move: mostly forward, so units reach the end of the route. */
export const MOVE_WEIGHT: Record<ActionName | 'undo', number> = {
	receive: 0,
	inspect: 12,
	accept: 12,
	clean: 12,
	machine: 12,
	paint: 12,
	assemble: 12,
	balance: 12,
	pack: 12,
	ship: 12,
	return: 6,
	release: 6,
	hold: 1.5,
	rework: 3,
	scrap: 0.7,
	undo: 1.5
};

/** Pick one item, weighted by its action, with `u` uniform in [0, 1). */
export function pickWeighted<T>(items: readonly T[], actionOf: (t: T) => ActionName | 'undo', u: number): T {
	// weight per action is shared among that action's variants, so eight rework targets weigh as one rework
	const perAction = new Map<string, number>();
	for (const it of items) perAction.set(actionOf(it), (perAction.get(actionOf(it)) ?? 0) + 1);
	const w = items.map((it) => MOVE_WEIGHT[actionOf(it)] / perAction.get(actionOf(it))!);
	let r = u * w.reduce((a, b) => a + b, 0);
	for (let i = 0; i < items.length; i++) {
		r -= w[i];
		if (r < 0) return items[i];
	}
	return items[items.length - 1];
}
