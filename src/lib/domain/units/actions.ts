/**
 * The moves a unit can make, each with the roles allowed to make it, the stage whose
 * station performs it, and the data it needs. The rules that decide whether a move is
 * allowed live in `machine.ts`; extra checks contributed by other parts of the shop
 * (balance record, assembly record, ...) live in `guards.ts`.
 */
import { z } from 'zod';
import type { Role } from '../auth/roles';
import { FLOOR_ROLES, INTAKE_ROLES, STEERING_ROLES } from '../auth/roles';
import type { Stage, UnitState } from './states';
import { STAGES } from './states';
import { FAILURE_MODES } from '../warranty/failure-modes';
import { strictObject } from '../input/fields';

export const ACTIONS = [
	'receive',
	'inspect',
	'accept',
	'scrap',
	'clean',
	'machine',
	'paint',
	'assemble',
	'balance',
	'pack',
	'ship',
	'hold',
	'release',
	'rework',
	'return'
] as const;
export type ActionName = (typeof ACTIONS)[number];

export function isActionName(value: unknown): value is ActionName {
	return typeof value === 'string' && (ACTIONS as readonly string[]).includes(value);
}

const reasonText = z
	.string({ error: 'Give a reason.' })
	.trim()
	.min(3, 'Give a reason of at least 3 characters.')
	.max(500, 'Keep the reason under 500 characters.');

const scrapReason = z
	.string({ error: 'Choose a scrap reason.' })
	.trim()
	.min(1, 'Choose a scrap reason.')
	.max(40, 'That scrap reason code is too long.');

/** Minutes of teardown labour before the verdict (the scrap report costs them); whole minutes, at most a day. */
const labourMinutes = z
	.number({ error: 'Give the teardown minutes as a number.' })
	.int('Give whole minutes.')
	.min(0, 'Minutes cannot be negative.')
	.max(24 * 60, 'More than a day of teardown is not plausible.');

/** The verdict data a teardown qualification, the trace-back verdict form or a teardown screen sends. */
const verdictFields = {
	labourMinutes: labourMinutes.optional(),
	failureMode: z.enum(FAILURE_MODES, { error: 'Choose a failure mode from the list.' }).optional(),
	/** Set by the teardown qualification: the verdict came with a checklist record. */
	inspected: z.boolean({ error: 'inspected is true or false.' }).optional()
};

/** A move that carries no data. */
const nothing = (name: string) => strictObject({}, name);

/**
 * The data each move takes, exactly: a key a move does not declare is refused with a sentence
 * naming it, so nothing unexpected is written to the append-only history. The keys listed here
 * are the ones the station screen, the teardown qualification, the trace-back verdict form, the
 * lead's and the office's flows and the demo seeders send.
 */
export const actionData = {
	receive: nothing('A receipt'),
	inspect: strictObject({ labourMinutes: labourMinutes.optional() }, 'A teardown'),
	accept: strictObject(verdictFields, 'An accept verdict'),
	scrap: strictObject({ reasonCode: scrapReason, ...verdictFields }, 'A scrap verdict'),
	clean: nothing('Cleaning'),
	machine: nothing('Machining'),
	paint: nothing('Painting'),
	assemble: nothing('Assembly'),
	balance: nothing('Balancing'),
	pack: nothing('Packing'),
	ship: nothing('Shipping'),
	hold: strictObject({ reason: reasonText }, 'A hold'),
	release: nothing('A release'),
	rework: strictObject(
		{
			toStage: z.enum(STAGES, { error: 'Choose the stage to send it back to.' }),
			reason: reasonText
		},
		'A send-back'
	),
	/** A customer's unit sent back unrepaired after a declined quote; the move itself marks it `unrepaired`. */
	return: nothing('A return unrepaired')
} satisfies Record<ActionName, z.ZodType>;

/** The data keys a move declares (a form picks only these from what it was sent). */
export function actionDataKeys(action: ActionName): string[] {
	return Object.keys(actionData[action].shape);
}

export interface ActionInfo {
	name: ActionName;
	/** What the button says. */
	label: string;
	/** Past tense for the history and the scan banner. */
	done: string;
	/** The stage whose station performs it; null when it is not tied to one stage. */
	stage: Stage | null;
	/** Roles allowed to make this move. */
	roles: readonly Role[];
	/** Roles that may make it without standing at a station of the right stage. */
	anywhere: readonly Role[];
}

/** The office and the lead send a customer's unit back unrepaired. */
const RETURN_ROLES: readonly Role[] = ['office', 'lead', 'owner'];

function stageMove(name: ActionName, stage: Stage, label: string, done: string): ActionInfo {
	return { name, label, done, stage, roles: FLOOR_ROLES, anywhere: STEERING_ROLES };
}

export const ACTION_INFO: Record<ActionName, ActionInfo> = {
	receive: {
		name: 'receive',
		label: 'Receive',
		done: 'Received',
		stage: null,
		roles: INTAKE_ROLES,
		anywhere: INTAKE_ROLES
	},
	inspect: stageMove('inspect', 'teardown', 'Tear down', 'Torn down'),
	accept: stageMove('accept', 'teardown', 'Accept', 'Accepted'),
	scrap: {
		name: 'scrap',
		label: 'Scrap',
		done: 'Scrapped',
		stage: null,
		roles: FLOOR_ROLES,
		anywhere: STEERING_ROLES
	},
	clean: stageMove('clean', 'clean', 'Cleaned', 'Cleaned'),
	machine: stageMove('machine', 'machine', 'Machined', 'Machined'),
	paint: stageMove('paint', 'paint', 'Painted', 'Painted'),
	assemble: stageMove('assemble', 'assemble', 'Assembled', 'Assembled'),
	balance: stageMove('balance', 'balance', 'Balanced', 'Balanced'),
	pack: stageMove('pack', 'pack', 'Packed', 'Packed'),
	ship: stageMove('ship', 'ship', 'Shipped', 'Shipped'),
	hold: {
		name: 'hold',
		label: 'Hold',
		done: 'Put on hold',
		stage: null,
		roles: FLOOR_ROLES,
		anywhere: STEERING_ROLES
	},
	release: {
		name: 'release',
		label: 'Release hold',
		done: 'Released',
		stage: null,
		roles: FLOOR_ROLES,
		anywhere: STEERING_ROLES
	},
	rework: {
		name: 'rework',
		label: 'Send back',
		done: 'Sent back',
		stage: null,
		roles: STEERING_ROLES,
		anywhere: STEERING_ROLES
	},
	return: {
		name: 'return',
		label: 'Return unrepaired',
		done: 'Returned unrepaired',
		stage: null,
		roles: RETURN_ROLES,
		anywhere: RETURN_ROLES
	}
};

/** States from which a customer's unit may go back to them unrepaired (after the verdict, before work). */
export const RETURNABLE: readonly UnitState[] = ['inspected', 'accepted'];

/** The state each stage move needs and the state it leaves. */
export const MOVES: Partial<Record<ActionName, { from: readonly UnitState[]; to: UnitState }>> = {
	inspect: { from: ['received'], to: 'inspected' },
	accept: { from: ['inspected'], to: 'accepted' },
	clean: { from: ['accepted'], to: 'cleaned' },
	machine: { from: ['cleaned'], to: 'machined' },
	paint: { from: ['machined'], to: 'painted' },
	assemble: { from: ['painted'], to: 'assembled' },
	balance: { from: ['assembled'], to: 'balanced' },
	pack: { from: ['balanced'], to: 'packed' },
	ship: { from: ['packed'], to: 'shipped' }
};

/** States from which a unit may be scrapped: at the verdict, or later when a defect is found. */
export const SCRAPPABLE: readonly UnitState[] = [
	'inspected',
	'accepted',
	'cleaned',
	'machined',
	'painted',
	'assembled',
	'balanced',
	'packed'
];
