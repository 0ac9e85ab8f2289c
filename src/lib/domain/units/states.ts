/**
 * The life of a unit through the shop, as states and the stages that produce them.
 *
 * A *state* says where a unit is ("machined"); a *stage* is the work a station does
 * ("machine") that moves a unit into its output state.
 */

export const UNIT_STATES = [
	'received',
	'inspected',
	'accepted',
	'scrapped',
	'cleaned',
	'machined',
	'painted',
	'assembled',
	'balanced',
	'packed',
	'shipped'
] as const;
export type UnitState = (typeof UNIT_STATES)[number];

/** The route of a good unit, in order. `scrapped` sits beside it, not on it. */
export const FLOW: readonly UnitState[] = [
	'received',
	'inspected',
	'accepted',
	'cleaned',
	'machined',
	'painted',
	'assembled',
	'balanced',
	'packed',
	'shipped'
];

export const TERMINAL_STATES: readonly UnitState[] = ['scrapped', 'shipped'];

export function isTerminal(state: UnitState): boolean {
	return TERMINAL_STATES.includes(state);
}

export function isUnitState(value: unknown): value is UnitState {
	return typeof value === 'string' && (UNIT_STATES as readonly string[]).includes(value);
}

/** Position on the good route; -1 for scrapped. */
export function flowIndex(state: UnitState): number {
	return FLOW.indexOf(state);
}

export const STAGES = [
	'teardown',
	'clean',
	'machine',
	'paint',
	'assemble',
	'balance',
	'pack',
	'ship'
] as const;
export type Stage = (typeof STAGES)[number];

export function isStage(value: unknown): value is Stage {
	return typeof value === 'string' && (STAGES as readonly string[]).includes(value);
}

export interface StageInfo {
	stage: Stage;
	/** Step number shown on the stage pill. */
	step: number;
	/** What the floor calls it. */
	label: string;
	/** States a unit is in while it waits for this stage. */
	input: readonly UnitState[];
	/** The state this stage's main move leaves the unit in. */
	output: UnitState;
}

export const STAGE_INFO: Record<Stage, StageInfo> = {
	teardown: { stage: 'teardown', step: 1, label: 'Teardown', input: ['received', 'inspected'], output: 'accepted' },
	clean: { stage: 'clean', step: 2, label: 'Clean', input: ['accepted'], output: 'cleaned' },
	machine: { stage: 'machine', step: 3, label: 'Machine', input: ['cleaned'], output: 'machined' },
	paint: { stage: 'paint', step: 4, label: 'Paint', input: ['machined'], output: 'painted' },
	assemble: { stage: 'assemble', step: 5, label: 'Assemble', input: ['painted'], output: 'assembled' },
	balance: { stage: 'balance', step: 6, label: 'Balance', input: ['assembled'], output: 'balanced' },
	pack: { stage: 'pack', step: 7, label: 'Pack', input: ['balanced'], output: 'packed' },
	ship: { stage: 'ship', step: 8, label: 'Ship', input: ['packed'], output: 'shipped' }
};

/** Words for each state, as a person reads them. */
export const STATE_LABEL: Record<UnitState, string> = {
	received: 'Received',
	inspected: 'Inspected',
	accepted: 'Accepted',
	scrapped: 'Scrapped',
	cleaned: 'Cleaned',
	machined: 'Machined',
	painted: 'Painted',
	assembled: 'Assembled',
	balanced: 'Balanced',
	packed: 'Packed',
	shipped: 'Shipped'
};

/** The stage a unit in `state` is waiting for, if any. */
export function nextStage(state: UnitState): Stage | null {
	for (const stage of STAGES) {
		if (STAGE_INFO[stage].input.includes(state)) return stage;
	}
	return null;
}

/** The state a unit is left in when it is sent back to redo `stage`. */
export function stateBefore(stage: Stage): UnitState {
	const info = STAGE_INFO[stage];
	return info.input[0];
}
