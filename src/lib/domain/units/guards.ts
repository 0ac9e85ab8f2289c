/**
 * Extra checks on a move, beyond the route itself. Each guard looks at the unit, the move
 * and the facts the server gathered about the unit (records kept elsewhere), and returns
 * a refusal sentence or null. Add a guard here when a later record must exist before a move.
 */
import type { ActionName } from './actions';
import type { Stage, UnitState } from './states';
import type { Role } from '../auth/roles';

export interface UnitSnapshot {
	serial: string;
	state: UnitState;
	held: boolean;
	holdReason: string | null;
}

/**
 * Facts about the unit kept outside its own row. The server fills in what it knows;
 * a guard that needs a fact that is missing treats it as not present.
 */
export interface UnitFacts {
	/** Scrap reason codes the shop has set up (active ones). */
	scrapReasonCodes?: readonly string[];
	/** A passing balance record exists for the unit's current build. */
	hasPassingBalance?: boolean;
	/** An assembly record within limits (or with an approved deviation) exists. */
	hasAssemblyRecord?: boolean;
	/** A customer's unit: null when no quote is needed, otherwise whether it is approved. */
	quoteApproved?: boolean | null;
	/** A customer's unit (linked to a rebuild order), and what became of its quote. */
	customerUnit?: boolean;
	quoteDeclined?: boolean;
	/** The unit's model family has a teardown checklist, so accepting it needs a qualification. */
	inspectionRequired?: boolean;
	/** A completed qualification with the accept verdict was recorded for this very move. */
	hasInspectionRecord?: boolean;
	[key: string]: unknown;
}

export interface GuardContext {
	unit: UnitSnapshot;
	action: ActionName;
	role: Role;
	stationStage: Stage | null;
	data: Record<string, unknown>;
	facts: UnitFacts;
}

export type Guard = (ctx: GuardContext) => string | null;

/** Scrap needs a reason the shop knows, when the server told us which reasons exist. */
const scrapReasonKnown: Guard = ({ unit, data, facts }) => {
	if (!facts.scrapReasonCodes) return null;
	const code = String(data.reasonCode ?? '');
	return facts.scrapReasonCodes.includes(code)
		? null
		: `${unit.serial}: "${code}" is not a scrap reason the shop uses; choose one from the list.`;
};

/** Balancing needs a passing balance run since the unit was last assembled (when the server said). */
const passingBalance: Guard = ({ unit, facts }) =>
	facts.hasPassingBalance === false
		? `${unit.serial} has no passing balance run since it was assembled; record the runs on its balance page first.`
		: null;

/** Assembly needs a record within limits, or a deviation a lead approved (when the server said). */
const assemblyRecorded: Guard = ({ unit, facts }) =>
	facts.hasAssemblyRecord === false
		? `${unit.serial} has no assembly record within limits; record end play, radial play, kits and wheels on its assembly page first (a lead may record a deviation).`
		: null;
export { quoteApprovedBeforeWork, returnOnlyCustomerUnits } from './customer-guards';
import { quoteApprovedBeforeWork, returnOnlyCustomerUnits } from './customer-guards';
/** Accept needs a completed qualification where the family has a checklist. */
export const inspectionRecorded: Guard = ({ unit, facts }) => {
	if (!facts.inspectionRequired) return null;
	return facts.hasInspectionRecord
		? null
		: `${unit.serial}: fill in the teardown checklist before accepting it.`;
};

export type GuardTable = Partial<Record<ActionName, readonly Guard[]>>;

export const DEFAULT_GUARDS: GuardTable = {
	scrap: [scrapReasonKnown],
	balance: [passingBalance],
	assemble: [assemblyRecorded],
	clean: [quoteApprovedBeforeWork],
	return: [returnOnlyCustomerUnits],
	accept: [inspectionRecorded]
};
