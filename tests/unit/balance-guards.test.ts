import { describe, expect, test } from 'vitest';
import { decide } from '../../src/lib/domain/units/machine';
import { assemblyFindings } from '../../src/lib/domain/balance/assembly';
import { specSchema } from '../../src/lib/domain/balance/spec';
import { demoSpecNumbers } from '../../src/lib/server/seed-balance';

const unit = (state: 'painted' | 'assembled') => ({ serial: 'SY-00009', state, held: false, holdReason: null });

describe('balance and assembly guards', () => {
	test('balance is refused without a passing run and allowed with one', () => {
		// Source: the shop's rule — no unit is balanced without a passing balance record.
		const no = decide(unit('assembled'), { action: 'balance', role: 'tech', stationStage: 'balance' }, { hasPassingBalance: false });
		expect(no).toMatchObject({ ok: false, kind: 'refused' });
		expect(!no.ok && no.message).toBe('SY-00009 has no passing balance run since it was assembled; record the runs on its balance page first.');
		expect(decide(unit('assembled'), { action: 'balance', role: 'tech', stationStage: 'balance' }, { hasPassingBalance: true })).toMatchObject({ ok: true, to: 'balanced' });
	});
	test('assembly is refused without an accepted assembly record', () => {
		// Source: the shop's rule — assembly needs a record within limits or a lead-approved deviation.
		const no = decide(unit('painted'), { action: 'assemble', role: 'lead', stationStage: null }, { hasAssemblyRecord: false });
		expect(no).toMatchObject({ ok: false, kind: 'refused' });
		expect(decide(unit('painted'), { action: 'assemble', role: 'tech', stationStage: 'assemble' }, { hasAssemblyRecord: true })).toMatchObject({ ok: true, to: 'assembled' });
	});
});

describe('assembly limits', () => {
	const limits = { endPlayMinMm: 0.025, endPlayMaxMm: 0.09, radialPlayMinMm: 0.3, radialPlayMaxMm: 0.6, wastegateMinKpa: 90, wastegateMaxKpa: 110 };
	test('each measurement against its window, with the sentence for the tech', () => {
		// Source: the model's limits (demo data); psi from NIST SP 811 (1 psi = 6.894 757 kPa): 120 kPa = 17.4 psi.
		expect(assemblyFindings(limits, { endPlayMm: 0.05, radialPlayMm: 0.45, wastegatePresetKpa: 100 })).toEqual([]);
		expect(assemblyFindings(limits, { endPlayMm: 0.09, radialPlayMm: 0.3, wastegatePresetKpa: 110 })).toEqual([]);
		expect(assemblyFindings(limits, { endPlayMm: 0.02, radialPlayMm: 0.7, wastegatePresetKpa: 120 })).toEqual([
			'End play 0.020 mm is below the minimum 0.025 mm.',
			'Radial play 0.700 mm is above the maximum 0.600 mm.',
			'Wastegate preset 120.0 kPa (17.4 psi) is above the maximum 110.0 kPa (16.0 psi). Boost above the window can overspeed the wheel.'
		]);
		expect(assemblyFindings(limits, { endPlayMm: 0.05, radialPlayMm: 0.45, wastegatePresetKpa: null })).toEqual(['Wastegate preset is missing; this model has a wastegate window.']);
		expect(assemblyFindings({ ...limits, wastegateMinKpa: null, wastegateMaxKpa: null }, { endPlayMm: 0.05, radialPlayMm: 0.45, wastegatePresetKpa: null })).toEqual([]);
	});
	test('every demo spec passes the owner form checks', () => {
		// Source: the spec form's own rules (the demo data must be something the owner could have typed).
		for (const code of ['CH-F46', 'CH-F52', 'CH-F58', 'CH-V49', 'CH-V55', 'CH-P61', 'CH-P66', 'CH-K60']) {
			expect(specSchema.safeParse(demoSpecNumbers(code)).success, code).toBe(true);
		}
		expect(specSchema.safeParse({ ...demoSpecNumbers('CH-F46'), wastegateMaxKpa: '' }).success).toBe(false);
	});
});
