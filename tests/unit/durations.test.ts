import { describe, expect, test } from 'vitest';
import { formatDuration, stateStays, timeInEachState } from '../../src/lib/domain/units/durations';

// ECMA-262 §21.4.1: a time value is milliseconds since 1970-01-01T00:00:00Z and a day is 86,400,000 ms.
const H = 3_600_000;

describe('time in each state', () => {
	const history = [
		{ toState: 'received' as const, at: '2026-11-30T08:00:00Z' },
		{ toState: 'inspected' as const, at: '2026-11-30T14:30:00Z' },
		{ toState: 'inspected' as const, at: '2026-11-30T15:00:00Z' }, // a hold: no new stay
		{ toState: 'accepted' as const, at: '2026-12-01T09:00:00Z' },
		{ toState: 'cleaned' as const, at: '2026-12-01T10:00:00Z' }
	];

	test('each stay runs to the next change of state, the last one to now', () => {
		const now = Date.parse('2026-12-01T12:15:00Z');
		const stays = stateStays(history, now);
		expect(stays.map((s) => [s.state, s.ms / H])).toEqual([
			['received', 6.5],
			['inspected', 18.5], // 14:30 to 09:00 next day
			['accepted', 1],
			['cleaned', 2.25]
		]);
		expect(stays[3].to).toBeNull();
	});

	test('a state visited twice (rework) adds up', () => {
		const t = timeInEachState(
			stateStays(
				[
					{ toState: 'assembled', at: 0 },
					{ toState: 'balanced', at: 2 * H },
					{ toState: 'assembled', at: 3 * H },
					{ toState: 'balanced', at: 7 * H },
					{ toState: 'shipped', at: 8 * H }
				],
				100 * H
			)
		);
		expect(t).toEqual([
			{ state: 'assembled', ms: 6 * H, visits: 2 },
			{ state: 'balanced', ms: 2 * H, visits: 2 },
			{ state: 'shipped', ms: 0, visits: 1 }
		]);
	});

	test('formatting', () => {
		expect(formatDuration(45 * 60_000)).toBe('45 min');
		expect(formatDuration(5.5 * H)).toBe('5.5 h');
		expect(formatDuration(47 * H)).toBe('47.0 h');
		expect(formatDuration(3 * 86_400_000 + 4 * H)).toBe('3 d 4 h');
		expect(formatDuration(2 * 86_400_000)).toBe('2 d');
	});
});
