/**
 * The unit state machine: decides whether a move is allowed and what it leaves the
 * unit as, and replays a unit's history to its current state. Pure: no storage.
 */
import type { Role } from '../auth/roles';
import { ACTION_INFO, MOVES, RETURNABLE, SCRAPPABLE, actionData, type ActionName } from './actions';
import { DEFAULT_GUARDS, type GuardTable, type UnitFacts, type UnitSnapshot } from './guards';
import {
	FLOW,
	STAGE_INFO,
	STATE_LABEL,
	flowIndex,
	isTerminal,
	nextStage,
	stateBefore,
	type Stage,
	type UnitState
} from './states';

export type { UnitSnapshot, UnitFacts } from './guards';

/** How sentences name each stage's work. */
const STAGE_NOUN: Record<Stage, string> = {
	teardown: 'teardown',
	clean: 'cleaning',
	machine: 'machining',
	paint: 'paint',
	assemble: 'assembly',
	balance: 'balancing',
	pack: 'packing',
	ship: 'shipping'
};

export interface MoveRequest {
	action: ActionName;
	role: Role;
	/** The stage of the station the move is made at; null when made away from a station. */
	stationStage: Stage | null;
	data?: Record<string, unknown>;
}

export type Refusal =
	| { ok: false; kind: 'forbidden'; message: string }
	| { ok: false; kind: 'invalid'; message: string; fields: Record<string, string[]> }
	| { ok: false; kind: 'refused'; message: string };

export interface Outcome {
	ok: true;
	from: UnitState;
	to: UnitState;
	held: boolean;
	holdReason: string | null;
	/** The data after validation and trimming. */
	data: Record<string, unknown>;
}

export type Decision = Outcome | Refusal;

function word(state: UnitState): string {
	return STATE_LABEL[state].toLowerCase();
}

function joinAnd(items: string[]): string {
	if (items.length <= 1) return items.join('');
	return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

function describe(unit: UnitSnapshot): string {
	return unit.state === 'shipped' ? `${unit.serial} has shipped` : `${unit.serial} is ${word(unit.state)}`;
}

/** The sentence for a stage move the unit is not ready for, or is past. */
export function outOfOrderSentence(unit: UnitSnapshot, stage: Stage): string {
	const info = STAGE_INFO[stage];
	const noun = STAGE_NOUN[stage];
	if (unit.state === 'scrapped') return `${unit.serial} is scrapped; a scrapped unit cannot move on.`;
	if (unit.state === 'shipped') return `${unit.serial} has shipped; it cannot move on.`;
	const here = flowIndex(unit.state);
	const needed = flowIndex(info.input[0]);
	if (here < needed) {
		const missing = FLOW.slice(here + 1, needed + 1).map(word);
		return `${describe(unit)}; ${noun} needs it ${joinAnd(missing)} first.`;
	}
	const waitingFor = nextStage(unit.state);
	const next = waitingFor ? ` It waits for ${STAGE_NOUN[waitingFor]}.` : '';
	return `${describe(unit)} already; ${noun} is behind it.${next}`;
}

/** The move a single scan makes at a station of `stage` for a unit in `state`. */
export function mainAction(stage: Stage, state: UnitState): ActionName | null {
	if (stage === 'teardown') return state === 'received' ? 'inspect' : null;
	for (const [name, move] of Object.entries(MOVES)) {
		if (ACTION_INFO[name as ActionName].stage === stage && move?.from.includes(state)) {
			return name as ActionName;
		}
	}
	return null;
}

/** The action a stage's station performs as its main move, whatever the unit's state. */
export function stageAction(stage: Stage): ActionName {
	if (stage === 'teardown') return 'inspect';
	const found = (Object.keys(MOVES) as ActionName[]).find(
		(name) => ACTION_INFO[name].stage === stage && name !== 'accept'
	);
	if (!found) throw new Error(`no move for stage ${stage}`);
	return found;
}

function fieldErrors(issues: readonly { code?: string; path: PropertyKey[]; message: string; keys?: string[] }[]): Record<string, string[]> {
	const out: Record<string, string[]> = Object.create(null);
	for (const issue of issues) {
		// an unknown key is reported under its own name
		const paths = issue.code === 'unrecognized_keys' && issue.keys ? issue.keys.map((k) => [...issue.path, k]) : [issue.path];
		for (const path of paths) {
			const key = path.map(String).join('.') || '_';
			(out[key] ??= []).push(issue.message);
		}
	}
	return out;
}

/**
 * Decide a move. Order of checks: may this role make it at all; is the data complete;
 * is the unit free to move (not terminal, not held); is it at the right station; does
 * the route allow it; do the extra guards agree.
 */
export function decide(
	unit: UnitSnapshot,
	request: MoveRequest,
	facts: UnitFacts = {},
	guards: GuardTable = DEFAULT_GUARDS
): Decision {
	const info = ACTION_INFO[request.action];
	if (!info) return { ok: false, kind: 'invalid', message: 'Unknown action.', fields: { action: ['Unknown action.'] } };
	if (!info.roles.includes(request.role)) {
		return { ok: false, kind: 'forbidden', message: `A ${request.role} cannot ${info.label.toLowerCase()} units.` };
	}
	const parsed = actionData[request.action].safeParse(request.data ?? {});
	if (!parsed.success) {
		const fields = fieldErrors(parsed.error.issues);
		return { ok: false, kind: 'invalid', message: parsed.error.issues[0]?.message ?? 'Check the data.', fields };
	}
	const data = parsed.data as Record<string, unknown>;

	if (request.action === 'receive') {
		return { ok: false, kind: 'refused', message: `${unit.serial} has already been received.` };
	}
	if (isTerminal(unit.state)) {
		return {
			ok: false,
			kind: 'refused',
			message:
				unit.state === 'scrapped'
					? `${unit.serial} is scrapped; a scrapped unit cannot move on.`
					: `${unit.serial} has shipped; it cannot move on.`
		};
	}
	if (request.action === 'release') {
		if (!unit.held) return { ok: false, kind: 'refused', message: `${unit.serial} is not on hold.` };
	} else if (unit.held) {
		const why = unit.holdReason ? ` (${unit.holdReason})` : '';
		return {
			ok: false,
			kind: 'refused',
			message: `${unit.serial} is on hold${why}; release the hold before moving it.`
		};
	}

	const steering = info.anywhere.includes(request.role);
	const waitingFor = nextStage(unit.state);
	if (!steering) {
		// A tech works at a station, and only on the work of that station's stage.
		if (!request.stationStage) {
			return { ok: false, kind: 'refused', message: `Scan ${unit.serial} in at a station to ${info.label.toLowerCase()} it.` };
		}
		if (info.stage && info.stage !== request.stationStage) {
			return {
				ok: false,
				kind: 'refused',
				message: `${STAGE_NOUN[info.stage]} is done at a ${STAGE_INFO[info.stage].label} station, not at ${STAGE_INFO[request.stationStage].label}.`
			};
		}
		if (!info.stage && waitingFor !== request.stationStage && !(request.action === 'scrap' && unit.state === 'inspected' && request.stationStage === 'teardown')) {
			const where = waitingFor ? STAGE_INFO[waitingFor].label : 'no';
			return {
				ok: false,
				kind: 'refused',
				message: `${describe(unit)} and waits at ${where} stations; ${info.label.toLowerCase()} it from there.`
			};
		}
	}

	let to: UnitState = unit.state;
	let held = unit.held;
	let holdReason = unit.holdReason;
	switch (request.action) {
		case 'hold':
			held = true;
			holdReason = String(data.reason);
			break;
		case 'release':
			held = false;
			holdReason = null;
			break;
		case 'scrap':
			if (!SCRAPPABLE.includes(unit.state)) {
				return {
					ok: false,
					kind: 'refused',
					message: `${describe(unit)}; tear it down before giving a scrap verdict.`
				};
			}
			to = 'scrapped';
			break;
		case 'rework': {
			const toStage = data.toStage as Stage;
			const target = stateBefore(toStage);
			if (toStage === 'teardown' || flowIndex(target) < flowIndex('accepted')) {
				return { ok: false, kind: 'refused', message: `A unit cannot be sent back to teardown; scrap it or hold it instead.` };
			}
			if (flowIndex(target) >= flowIndex(unit.state)) {
				return {
					ok: false,
					kind: 'refused',
					message: `${describe(unit)}; it has not been through ${STAGE_NOUN[toStage]} yet, so it cannot be sent back to it.`
				};
			}
			to = target;
			break;
		}
		case 'return':
			if (!RETURNABLE.includes(unit.state)) {
				return {
					ok: false,
					kind: 'refused',
					message: `${describe(unit)}; only a unit that is torn down or accepted, before any work, can go back unrepaired.`
				};
			}
			to = 'shipped';
			data.unrepaired = true;
			break;
		default: {
			const move = MOVES[request.action];
			if (!move || !info.stage) {
				return { ok: false, kind: 'refused', message: `${info.label} is not a move.` };
			}
			if (!move.from.includes(unit.state)) {
				if (request.action === 'accept' && unit.state === 'received') {
					return { ok: false, kind: 'refused', message: `${describe(unit)}; tear it down before giving a verdict.` };
				}
				return { ok: false, kind: 'refused', message: outOfOrderSentence(unit, info.stage) };
			}
			to = move.to;
		}
	}

	for (const guard of guards[request.action] ?? []) {
		const refusal = guard({ unit, action: request.action, role: request.role, stationStage: request.stationStage, data, facts });
		if (refusal) return { ok: false, kind: 'refused', message: refusal };
	}
	return { ok: true, from: unit.state, to, held, holdReason, data };
}

/** One entry of a unit's history, as far as the state machine cares. */
export interface HistoryEntry {
	action: ActionName | 'undo' | string;
	fromState: UnitState | null;
	toState: UnitState;
	/** For holds: the reason. */
	data?: Record<string, unknown> | null;
	/** For an undo: whether the unit was held after the event it undoes' predecessor. */
}

export interface Folded {
	state: UnitState;
	held: boolean;
	holdReason: string | null;
}

export class BrokenHistoryError extends Error {}

/**
 * The unit's current state as the fold of its history. Every entry must start where the
 * previous one ended; a history that does not is reported, never silently repaired.
 */
export function replay(serial: string, history: readonly HistoryEntry[]): Folded {
	let folded: Folded | null = null;
	for (const [i, entry] of history.entries()) {
		if (folded === null) {
			if (entry.action !== 'receive' || entry.fromState !== null) {
				throw new BrokenHistoryError(`${serial}: history must begin with its receipt.`);
			}
			folded = { state: entry.toState, held: false, holdReason: null };
			continue;
		}
		if (entry.fromState !== folded.state) {
			throw new BrokenHistoryError(
				`${serial}: entry ${i + 1} (${entry.action}) starts at ${entry.fromState} but the unit was ${folded.state}.`
			);
		}
		let held: boolean = folded.held;
		let holdReason: string | null = folded.holdReason;
		if (entry.action === 'hold') {
			held = true;
			holdReason = String(entry.data?.reason ?? '');
		} else if (entry.action === 'release') {
			held = false;
			holdReason = null;
		} else if (entry.data && typeof entry.data.held === 'boolean') {
			// compensating entries carry the hold state they restore
			held = entry.data.held;
			holdReason = held ? String(entry.data.holdReason ?? '') : null;
		}
		folded = { state: entry.toState, held, holdReason };
	}
	if (!folded) throw new BrokenHistoryError(`${serial}: no history.`);
	return folded;
}
