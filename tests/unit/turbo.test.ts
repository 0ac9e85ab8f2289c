import { describe, expect, test } from 'vitest';
import { geopotential, pressureAtAltitude } from '../../src/lib/domain/turbo/atmosphere';
import { kpaToPsi, pressureRatio, pressureRatioAtAltitude, psiToKpa, speedAtTipLimit, tipSpeed, trim } from '../../src/lib/domain/turbo/compressor';

describe('US Standard Atmosphere 1976', () => {
	test('101.325 kPa at sea level, 84.56 kPa at 1500 m', () => {
		// Source: U.S. Standard Atmosphere, 1976 (NOAA-S/T 76-1562), table of pressure by geometric altitude.
		expect(pressureAtAltitude(0) / 1000).toBeCloseTo(101.325, 6);
		expect(pressureAtAltitude(1500) / 1000).toBeCloseTo(84.56, 2);
		expect(pressureAtAltitude(11000) / 1000).toBeCloseTo(22.7, 1); // 1976 table: 22.700 kPa at 11 km geometric
		expect(geopotential(1500)).toBeCloseTo(1499.65, 2);
		expect(() => pressureAtAltitude(50000)).toThrow();
	});
});

describe('pressure units and ratio', () => {
	test('1 psi = 6.894 757 kPa', () => {
		// Source: NIST SP 811 (2008), appendix B.8: psi → Pa, 6.894 757 E+03.
		expect(psiToKpa(1)).toBeCloseTo(6.894757, 6);
		expect(kpaToPsi(6.894757)).toBeCloseTo(1, 6);
	});
	test('18 psi gauge at sea level → PR 2.224', () => {
		// Source: check value PR ≈ 2.224 from (18 psi·6.894757 + 101.325)/101.325 with the 1976 sea-level pressure.
		const pr = pressureRatioAtAltitude(psiToKpa(18), 0);
		expect(Math.abs(pr - 2.224)).toBeLessThan(0.001);
		expect(pressureRatio(0, 100)).toBe(1);
		// The same boost at 1500 m gives a higher ratio (thinner air): (124.106 + 84.56)/84.56.
		expect(pressureRatioAtAltitude(psiToKpa(18), 1500)).toBeCloseTo((psiToKpa(18) + 84.5597) / 84.5597, 3);
	});
});

describe('compressor wheel', () => {
	test('trim 1.695 in / 2.285 in → 55', () => {
		// Source: common practice, trim = (inducer/exducer)²·100; check value ≈ 55.
		expect(trim(1.695, 2.285)).toBeCloseTo(55, 0);
		expect(trim(1.695, 2.285)).toBeCloseTo(55.03, 2);
	});
	test('tip speed π·D·n/60 and the speed at the tip-speed limit', () => {
		// Source: circumferential speed v = π·D·n/60 (any mechanics handbook); 60 mm at 150 000 rpm = 471.24 m/s.
		expect(tipSpeed(60, 150000)).toBeCloseTo(471.239, 3);
		expect(speedAtTipLimit(60, tipSpeed(60, 150000))).toBeCloseTo(150000, 6);
		expect(speedAtTipLimit(50, 500)).toBeCloseTo(190985.9, 1);
	});
});
