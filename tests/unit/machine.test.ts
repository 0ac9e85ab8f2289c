import { describe, expect, test } from 'vitest';
import { ACTIONS, ACTION_INFO, type ActionName } from '../../src/lib/domain/units/actions';
import { decide, mainAction, outOfOrderSentence, replay, BrokenHistoryError } from '../../src/lib/domain/units/machine';
import { FLOW, STAGES, STAGE_INFO, UNIT_STATES, type Stage, type UnitState } from '../../src/lib/domain/units/states';
import { ROLES, type Role } from '../../src/lib/domain/auth/roles';

const unit = (state: UnitState, held = false) => ({ serial: 'SY-00421', state, held, holdReason: held ? 'waiting for a wheel' : null });

/** The good route as (action, from, to, stage), written out by hand rather than derived. */
const ROUTE: [ActionName, UnitState, UnitState, Stage][] = [
	['inspect', 'received', 'inspected', 'teardown'],
	['accept', 'inspected', 'accepted', 'teardown'],
	['clean', 'accepted', 'cleaned', 'clean'],
	['machine', 'cleaned', 'machined', 'machine'],
	['paint', 'machined', 'painted', 'paint'],
	['assemble', 'painted', 'assembled', 'assemble'],
	['balance', 'assembled', 'balanced', 'balance'],
	['pack', 'balanced', 'packed', 'pack'],
	['ship', 'packed', 'shipped', 'ship']
];

describe('the good route', () => {
	test.each(ROUTE)('%s moves a %s unit to %s at a %s station', (action, from, to, stage) => {
		const d = decide(unit(from), { action, role: 'tech', stationStage: stage });
		expect(d).toMatchObject({ ok: true, from, to, held: false });
	});

	test('every stage move is refused from every other state, for a tech at the right station', () => {
		let refusals = 0;
		for (const [action, from, , stage] of ROUTE) {
			for (const state of UNIT_STATES) {
				if (state === from) continue;
				const d = decide(unit(state), { action, role: 'tech', stationStage: stage });
				expect(d, `${action} from ${state}`).toMatchObject({ ok: false, kind: 'refused' });
				refusals++;
			}
		}
		expect(refusals).toBe(ROUTE.length * (UNIT_STATES.length - 1));
	});

	test('the refusal says what is missing, in the floor’s words', () => {
		const d = decide(unit('cleaned'), { action: 'assemble', role: 'tech', stationStage: 'assemble' });
		expect(d).toMatchObject({ ok: false, message: 'SY-00421 is cleaned; assembly needs it machined and painted first.' });
		expect(outOfOrderSentence(unit('painted'), 'paint')).toBe('SY-00421 is painted already; paint is behind it. It waits for assembly.');
		expect(outOfOrderSentence(unit('shipped'), 'pack')).toBe('SY-00421 has shipped; it cannot move on.');
	});

	test('a tech must be at a station of the move’s stage', () => {
		const wrong = decide(unit('cleaned'), { action: 'machine', role: 'tech', stationStage: 'paint' });
		expect(wrong).toMatchObject({ ok: false, kind: 'refused' });
		const none = decide(unit('cleaned'), { action: 'machine', role: 'tech', stationStage: null });
		expect(none).toMatchObject({ ok: false, kind: 'refused' });
	});

	test('the lead and owner may move work from anywhere', () => {
		for (const role of ['lead', 'owner'] as Role[]) {
			expect(decide(unit('cleaned'), { action: 'machine', role, stationStage: null })).toMatchObject({ ok: true, to: 'machined' });
		}
	});

	test('office staff cannot make floor moves', () => {
		for (const [action, from, , stage] of ROUTE) {
			expect(decide(unit(from), { action, role: 'office', stationStage: stage })).toMatchObject({ ok: false, kind: 'forbidden' });
		}
	});

	test('every role × action pair is either allowed by the table or forbidden', () => {
		for (const role of ROLES) {
			for (const action of ACTIONS) {
				const d = decide(unit('received'), { action, role, stationStage: 'teardown', data: {} });
				const forbidden = !d.ok && d.kind === 'forbidden';
				expect(forbidden, `${role} ${action}`).toBe(!ACTION_INFO[action].roles.includes(role));
			}
		}
	});
});

describe('the verdict', () => {
	test('scrap needs a reason code', () => {
		const d = decide(unit('inspected'), { action: 'scrap', role: 'tech', stationStage: 'teardown', data: {} });
		expect(d).toMatchObject({ ok: false, kind: 'invalid', fields: { reasonCode: ['Choose a scrap reason.'] } });
	});

	test('scrap with a known reason ends the unit', () => {
		const d = decide(
			unit('inspected'),
			{ action: 'scrap', role: 'tech', stationStage: 'teardown', data: { reasonCode: 'TH-CRACK' } },
			{ scrapReasonCodes: ['TH-CRACK'] }
		);
		expect(d).toMatchObject({ ok: true, to: 'scrapped' });
	});

	test('an unknown reason code is refused when the shop’s list is known', () => {
		const d = decide(
			unit('inspected'),
			{ action: 'scrap', role: 'tech', stationStage: 'teardown', data: { reasonCode: 'NOPE' } },
			{ scrapReasonCodes: ['TH-CRACK'] }
		);
		expect(d).toMatchObject({ ok: false, kind: 'refused' });
	});

	test('a received unit cannot be scrapped or accepted before teardown', () => {
		expect(decide(unit('received'), { action: 'scrap', role: 'lead', stationStage: null, data: { reasonCode: 'X' } })).toMatchObject({ ok: false });
		expect(decide(unit('received'), { action: 'accept', role: 'tech', stationStage: 'teardown' })).toMatchObject({ ok: false });
	});

	test('a crack found at machining scraps an accepted unit, at the lathe', () => {
		const d = decide(unit('cleaned'), { action: 'scrap', role: 'tech', stationStage: 'machine', data: { reasonCode: 'POROSITY' } });
		expect(d).toMatchObject({ ok: true, to: 'scrapped' });
		const elsewhere = decide(unit('cleaned'), { action: 'scrap', role: 'tech', stationStage: 'paint', data: { reasonCode: 'POROSITY' } });
		expect(elsewhere).toMatchObject({ ok: false, kind: 'refused' });
	});
});

describe('terminal states', () => {
	test.each(['scrapped', 'shipped'] as UnitState[])('nothing moves a %s unit', (state) => {
		for (const action of ACTIONS) {
			const d = decide(unit(state), { action, role: 'owner', stationStage: null, data: { reasonCode: 'TH-CRACK', reason: 'a reason', toStage: 'paint' } });
			expect(d.ok, `${action} on ${state}`).toBe(false);
		}
	});
});

describe('holds', () => {
	test('a hold needs a reason and keeps the state', () => {
		expect(decide(unit('machined'), { action: 'hold', role: 'lead', stationStage: null, data: {} })).toMatchObject({ ok: false, kind: 'invalid' });
		expect(decide(unit('machined'), { action: 'hold', role: 'lead', stationStage: null, data: { reason: 'no paint' } })).toMatchObject({
			ok: true,
			to: 'machined',
			held: true,
			holdReason: 'no paint'
		});
	});

	test('a held unit cannot move until released, and release returns it to where it was', () => {
		const d = decide(unit('machined', true), { action: 'paint', role: 'tech', stationStage: 'paint' });
		expect(d).toMatchObject({ ok: false, kind: 'refused', message: 'SY-00421 is on hold (waiting for a wheel); release the hold before moving it.' });
		expect(decide(unit('machined', true), { action: 'release', role: 'tech', stationStage: 'paint' })).toMatchObject({ ok: true, to: 'machined', held: false });
	});

	test('a tech holds only at the station the unit waits for', () => {
		expect(decide(unit('machined'), { action: 'hold', role: 'tech', stationStage: 'paint', data: { reason: 'dent' } })).toMatchObject({ ok: true });
		expect(decide(unit('machined'), { action: 'hold', role: 'tech', stationStage: 'ship', data: { reason: 'dent' } })).toMatchObject({ ok: false });
	});

	test('releasing a unit that is not held is refused; so is a second hold', () => {
		expect(decide(unit('machined'), { action: 'release', role: 'lead', stationStage: null })).toMatchObject({ ok: false });
		expect(decide(unit('machined', true), { action: 'hold', role: 'lead', stationStage: null, data: { reason: 'again' } })).toMatchObject({ ok: false });
	});
});

describe('rework', () => {
	test('the lead sends a failed balance back to assembly', () => {
		const d = decide(unit('balanced'), { action: 'rework', role: 'lead', stationStage: null, data: { toStage: 'assemble', reason: 'failed balance' } });
		expect(d).toMatchObject({ ok: true, to: 'painted' });
	});

	test('a paint defect goes back to paint', () => {
		const d = decide(unit('assembled'), { action: 'rework', role: 'lead', stationStage: null, data: { toStage: 'paint', reason: 'runs in the paint' } });
		expect(d).toMatchObject({ ok: true, to: 'machined' });
	});

	test('a tech cannot send work back', () => {
		const d = decide(unit('assembled'), { action: 'rework', role: 'tech', stationStage: 'balance', data: { toStage: 'paint', reason: 'runs' } });
		expect(d).toMatchObject({ ok: false, kind: 'forbidden' });
	});

	test('not to a stage it has not been through, nor to teardown, and only with a reason', () => {
		expect(decide(unit('machined'), { action: 'rework', role: 'lead', stationStage: null, data: { toStage: 'balance', reason: 'x y z' } })).toMatchObject({ ok: false, kind: 'refused' });
		expect(decide(unit('machined'), { action: 'rework', role: 'lead', stationStage: null, data: { toStage: 'teardown', reason: 'x y z' } })).toMatchObject({ ok: false, kind: 'refused' });
		expect(decide(unit('machined'), { action: 'rework', role: 'lead', stationStage: null, data: { toStage: 'clean' } })).toMatchObject({ ok: false, kind: 'invalid' });
	});
});

describe('main action of a scan', () => {
	test('each station’s scan makes its stage move from the stage’s input state', () => {
		for (const stage of STAGES) {
			const input = STAGE_INFO[stage].input[0];
			const action = mainAction(stage, input);
			expect(action, stage).not.toBeNull();
			expect(decide(unit(input), { action: action!, role: 'tech', stationStage: stage }).ok).toBe(true);
		}
	});
	test('a teardown scan of an inspected unit asks for the verdict instead', () => {
		expect(mainAction('teardown', 'inspected')).toBeNull();
	});
});

describe('replay', () => {
	test('folds a history to its state, holds included', () => {
		const folded = replay('SY-00001', [
			{ action: 'receive', fromState: null, toState: 'received' },
			{ action: 'inspect', fromState: 'received', toState: 'inspected' },
			{ action: 'accept', fromState: 'inspected', toState: 'accepted' },
			{ action: 'hold', fromState: 'accepted', toState: 'accepted', data: { reason: 'no slot' } }
		]);
		expect(folded).toEqual({ state: 'accepted', held: true, holdReason: 'no slot' });
	});
	test('a history with a gap is reported', () => {
		expect(() =>
			replay('SY-00001', [
				{ action: 'receive', fromState: null, toState: 'received' },
				{ action: 'clean', fromState: 'accepted', toState: 'cleaned' }
			])
		).toThrow(BrokenHistoryError);
	});
	test('the good route is the FLOW list', () => {
		expect(ROUTE.map((r) => r[2])).toEqual(FLOW.slice(1));
	});
});
