import fc from 'fast-check';
import { expect, test } from 'vitest';
import { ACTIONS, type ActionName } from '../../src/lib/domain/units/actions';
import { decide, replay, type HistoryEntry } from '../../src/lib/domain/units/machine';
import { STAGES, TERMINAL_STATES, UNIT_STATES, isTerminal, type UnitState } from '../../src/lib/domain/units/states';
import { ROLES } from '../../src/lib/domain/auth/roles';

const step = fc.record({
	action: fc.constantFrom(...ACTIONS.filter((a) => a !== 'receive')),
	role: fc.constantFrom(...ROLES),
	stationStage: fc.option(fc.constantFrom(...STAGES), { nil: null }),
	data: fc.record(
		{
			reasonCode: fc.constantFrom('TH-CRACK', 'BORE', '', 'UNKNOWN'),
			reason: fc.oneof(fc.constant('waiting for a wheel'), fc.string({ maxLength: 6 })),
			toStage: fc.constantFrom(...STAGES, 'nowhere')
		},
		{ requiredKeys: [] }
	)
});

test('random action sequences: the state is always valid, terminal stays terminal, replay equals the state', () => {
	fc.assert(
		fc.property(fc.array(step, { maxLength: 60 }), (steps) => {
			let state: UnitState = 'received';
			let held = false;
			let holdReason: string | null = null;
			const history: HistoryEntry[] = [{ action: 'receive', fromState: null, toState: 'received' }];
			for (const s of steps) {
				const before = state;
				const d = decide({ serial: 'SY-00001', state, held, holdReason }, { ...s, action: s.action as ActionName }, { scrapReasonCodes: ['TH-CRACK', 'BORE'] });
				if (d.ok) {
					expect(d.from).toBe(before);
					history.push({ action: s.action, fromState: d.from, toState: d.to, data: d.data });
					state = d.to;
					held = d.held;
					holdReason = d.holdReason;
				}
				expect(UNIT_STATES).toContain(state);
				if (isTerminal(before)) expect(state).toBe(before);
				if (held) expect(TERMINAL_STATES).not.toContain(state);
			}
			expect(replay('SY-00001', history)).toEqual({ state, held, holdReason });
		}),
		{ numRuns: 2000 }
	);
});

test('a steering role can always walk a fresh unit to shipped by the main moves', () => {
	fc.assert(
		fc.property(fc.constantFrom('lead', 'owner'), (role) => {
			let state: UnitState = 'received';
			for (const action of ['inspect', 'accept', 'clean', 'machine', 'paint', 'assemble', 'balance', 'pack', 'ship'] as const) {
				const d = decide({ serial: 'SY-00002', state, held: false, holdReason: null }, { action, role: role as 'lead' | 'owner', stationStage: null });
				expect(d.ok).toBe(true);
				if (d.ok) state = d.to;
			}
			expect(state).toBe('shipped');
		})
	);
});
