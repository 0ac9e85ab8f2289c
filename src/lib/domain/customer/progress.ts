/** A customer's view of their unit: the stages in plain words, and which e-mail a change sends. */
import type { UnitState } from '../units/states';

export interface CustomerStep {
	key: string;
	label: string;
	/** States in which the unit is at this step. */
	states: readonly UnitState[];
}

export const CUSTOMER_STEPS: readonly CustomerStep[] = [
	{ key: 'received', label: 'We have your unit', states: ['received'] },
	{ key: 'inspected', label: 'Taken apart and checked', states: ['inspected', 'accepted'] },
	{ key: 'cleaned', label: 'Cleaned', states: ['cleaned'] },
	{ key: 'machined', label: 'Parts machined', states: ['machined', 'painted'] },
	{ key: 'assembled', label: 'Rebuilt', states: ['assembled'] },
	{ key: 'balanced', label: 'Balanced and tested', states: ['balanced'] },
	{ key: 'packed', label: 'Packed, ready to ship', states: ['packed'] },
	{ key: 'shipped', label: 'On its way to you', states: ['shipped'] }
];

/** Index of the step the unit is at; -1 when it was scrapped. */
export function customerStepIndex(state: UnitState): number {
	return CUSTOMER_STEPS.findIndex((s) => s.states.includes(state));
}

export const NOTICE_KINDS = ['received', 'quote_ready', 'in_work', 'shipped'] as const;
export type NoticeKind = (typeof NOTICE_KINDS)[number];

export const NOTICE_LABEL: Record<NoticeKind, string> = {
	received: 'We received the unit (with the status link)',
	quote_ready: 'The quote is ready',
	in_work: 'Work has started',
	shipped: 'It has shipped (with the tracking number)'
};

/** The notice a unit move sends to the customer, if any. */
export function noticeForMove(action: string, toState: UnitState): NoticeKind | null {
	if (action === 'clean' && toState === 'cleaned') return 'in_work';
	if (toState === 'shipped' && (action === 'ship' || action === 'return')) return 'shipped';
	return null;
}
