import { describe, expect, test } from 'vitest';
import { completion, equivalentUnits, planModel, weeklyDemand } from '../../src/lib/domain/plan/build-plan';
import { isoWeek, pastWeeks, weekStart } from '../../src/lib/domain/plan/weeks';

describe('ISO 8601 weeks', () => {
	// Source: ISO 8601 week-date examples as listed in the Wikipedia article "ISO week date":
	// 2008-12-29 is 2009-W01-1; 2010-01-03 is 2009-W53-7; 2005-01-01 is 2004-W53-6; 2008-12-28 is 2008-W52-7.
	test.each([
		['2008-12-29', '2009-W01', 1],
		['2010-01-03', '2009-W53', 7],
		['2005-01-01', '2004-W53', 6],
		['2008-12-28', '2008-W52', 7]
	])('%s is %s day %i', (date, label, day) => {
		const w = isoWeek(date);
		expect(w.label).toBe(label);
		expect(w.day).toBe(day);
	});

	test('weeks start on Monday; past weeks exclude the current one', () => {
		expect(weekStart('2010-01-03')).toBe('2009-12-28');
		expect(weekStart('2008-12-29')).toBe('2008-12-29');
		expect(pastWeeks('2026-12-02', 3)).toEqual(['2026-11-09', '2026-11-16', '2026-11-23']);
	});
});

describe('equivalent units of work in progress', () => {
	// Source: the equivalent-units method of process costing (units × percentage of completion),
	// common practice; here completion is the share of the eight-step route done. Worked by hand:
	// 4 received × 0 + 8 machined × 4/8 + 2 balanced × 7/8 = 0 + 4 + 1.75 = 5.75.
	test('a worked example', () => {
		expect(completion('received')).toBe(0);
		expect(completion('machined')).toBe(0.5);
		expect(completion('balanced')).toBe(7 / 8);
		expect(
			equivalentUnits([
				{ state: 'received', count: 4 },
				{ state: 'machined', count: 8 },
				{ state: 'balanced', count: 2 }
			])
		).toBeCloseTo(5.75, 10);
	});

	test('packed, shipped and scrapped units are not WIP', () => {
		expect(equivalentUnits([{ state: 'packed', count: 3 }, { state: 'shipped', count: 3 }, { state: 'scrapped', count: 3 }])).toBe(0);
	});
});

describe('the build suggestion', () => {
	test('weekly demand sums order lines into their weeks', () => {
		expect(weeklyDemand(['2026-11-16', '2026-11-23'], [{ week: '2026-11-16', quantity: 2 }, { week: '2026-11-23', quantity: 3 }, { week: '2026-11-23', quantity: 1 }, { week: '2026-10-05', quantity: 9 }])).toEqual([2, 4]);
	});

	test('the NIST series as demand: forecast 71.50, less stock and equivalent WIP, rounded up', () => {
		// Forecast from NIST/SEMATECH §6.4.3.1 (next period ≈ 71.50); 30 finished + 20 machined (= 10
		// equivalent) leaves 31.5 → 32 to build.
		const p = planModel({ history: [71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70], alpha: 0.1, finished: 30, wip: [{ state: 'machined', count: 20 }], openDue: 12 });
		expect(p.forecast).toBeCloseTo(71.5, 2);
		expect(p.demand).toBeCloseTo(71.5, 2);
		expect(p.equivalentWip).toBe(10);
		expect(p.suggested).toBe(32);
		expect(p.fit.mse).toBeCloseTo(18.98, 1);
	});

	test('open orders due this week above the forecast set the demand', () => {
		const p = planModel({ history: [1, 1, 1], alpha: 0.5, finished: 2, wip: [], openDue: 6 });
		expect(p.demand).toBe(6);
		expect(p.suggested).toBe(4);
	});

	test('never below zero; no history means the orders alone', () => {
		expect(planModel({ history: [2, 2], alpha: 0.3, finished: 10, wip: [], openDue: 0 }).suggested).toBe(0);
		expect(planModel({ history: [], alpha: 0.3, finished: 0, wip: [], openDue: 3 }).suggested).toBe(3);
	});
});
