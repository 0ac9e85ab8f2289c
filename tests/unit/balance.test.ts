import { describe, expect, test } from 'vitest';
import { abs, angleOf, polar, sub, toPolar } from '../../src/lib/domain/balance/complex';
import {
	GMM_PER_OZIN,
	effectiveGrade,
	fromGmm,
	permissibleUnbalance,
	specificUnbalance,
	toGmm
} from '../../src/lib/domain/balance/tolerance';
import { allocate, judge, leverShares, toBearingPlanes, type RotorGeometry } from '../../src/lib/domain/balance/allocation';
import { asMode, singlePlaneCorrection, splitToPositions, sumParts, twoPlaneCorrection } from '../../src/lib/domain/balance/correction';

const inboard: RotorGeometry = { bearingCompMm: 0, bearingTurbMm: 1000, centreOfMassMm: 500, planeCompMm: 100, planeTurbMm: 900 };

describe('permissible residual unbalance', () => {
	test('100 kg at 3000 rpm, G 6.3 → 2005.4 g·mm, 1002.7 g·mm per plane', () => {
		// Source: ISO 21940-11:2016, U_per = 1000·G·m/Ω; worked value 2005.4 g·mm, half per plane for a symmetric rotor.
		const u = permissibleUnbalance(6.3, 100, 3000);
		expect(u).toBeCloseTo(2005.4, 1);
		const a = allocate(u, 'symmetric', inboard);
		expect(a.planes[0].tolGmm).toBeCloseTo(1002.7, 1);
		expect(a.planes[1].tolGmm).toBeCloseTo(1002.7, 1);
	});

	test('specific unbalance e_per = U_per / m', () => {
		// Source: ISO 21940-11:2016 definition e_per = U_per / m (g·mm/kg).
		expect(specificUnbalance(6.3, 3000)).toBeCloseTo(permissibleUnbalance(6.3, 100, 3000) / 100, 9);
	});

	test('the shop tightening factor scales the grade, and bad input is refused', () => {
		// Source: arithmetic of the shop's own rule (half the ISO allowance for factor 0.5).
		expect(effectiveGrade(6.3, 0.5)).toBeCloseTo(3.15, 12);
		expect(() => effectiveGrade(6.3, 0)).toThrow();
		expect(() => effectiveGrade(6.3, 1.5)).toThrow();
		expect(() => permissibleUnbalance(6.3, 0, 3000)).toThrow();
	});
});

describe('units of unbalance', () => {
	test('1 oz·in = 720.077 887 375 g·mm', () => {
		// Source: NIST SP 811, 1 oz (avoirdupois) = 28.349 523 125 g, 1 in = 25.4 mm (exact).
		expect(GMM_PER_OZIN).toBeCloseTo(720.077887375, 9);
		expect(toGmm(1, 'oz_in')).toBeCloseTo(720.077887375, 9);
		expect(fromGmm(720.077887375, 'oz_in')).toBeCloseTo(1, 6);
	});
	test('mg·mm and grams at a radius', () => {
		// Source: SI prefixes (1 g = 1000 mg); unbalance U = m·r (ISO 21940-2 definition of unbalance).
		expect(toGmm(2500, 'mg_mm')).toBeCloseTo(2.5, 12);
		expect(toGmm(0.4, 'g', 25)).toBeCloseTo(10, 12);
		expect(fromGmm(10, 'mg', 25)).toBeCloseTo(400, 9);
		expect(() => toGmm(1, 'g')).toThrow();
	});
});

describe('allocation to two planes', () => {
	test('lever rule U_A = U·L_B/L, U_B = U·L_A/L, kept within 0.3–0.7', () => {
		// Source: ISO 21940-11:2016 allocation for inboard rotors with the 0.3·U ≤ share ≤ 0.7·U limits.
		const g = { ...inboard, centreOfMassMm: 420 };
		const a = allocate(1000, 'lever', g);
		expect(a.reference).toBe('correction_planes');
		expect(a.planes[0].tolGmm).toBeCloseTo(600, 9); // L_B = 480, L = 800
		expect(a.planes[1].tolGmm).toBeCloseTo(400, 9);
		const near = allocate(1000, 'lever', { ...inboard, centreOfMassMm: 150 });
		expect(near.planes[0].tolGmm).toBeCloseTo(700, 9);
		expect(near.planes[1].tolGmm).toBeCloseTo(300, 9);
		expect(near.planes[0].limited).toBe(true);
		expect(leverShares(0, 10, 5).shareA).toBeCloseTo(0.5, 12);
	});

	test('wheels outside the bearings: tolerance at the bearing planes, unbalance carried by statics', () => {
		// Source: ISO 21940-11:2016 takes the bearing planes as reference planes; transfer by force and moment balance (statics).
		const turbo: RotorGeometry = { bearingCompMm: 30, bearingTurbMm: 70, centreOfMassMm: 55, planeCompMm: 10, planeTurbMm: 90 };
		const a = allocate(10, 'lever', turbo);
		expect(a.reference).toBe('bearing_planes');
		expect(a.planes[0].tolGmm).toBeCloseTo(3.75, 9); // (70−55)/40
		expect(a.planes[1].tolGmm).toBeCloseTo(6.25, 9);
		// A pure static unbalance of 2 at plane A (z=10): the bearing reactions are 2·(60/40) = 3 and 2·(−20/40) = −1.
		const [u1, u2] = toBearingPlanes(turbo, polar(2, 0), polar(0, 0));
		expect(u1.re).toBeCloseTo(3, 12);
		expect(u2.re).toBeCloseTo(-1, 12);
		const verdict = judge(a, turbo, polar(2, 0), polar(0, 0));
		expect(verdict.planes[0].used).toBeCloseTo(3 / 3.75, 9);
		expect(verdict.pass).toBe(true);
		expect(judge(a, turbo, polar(3, 0), polar(0, 0)).pass).toBe(false);
	});
});

describe('influence-coefficient correction', () => {
	test('single plane: 7 @ 160°, trial 100 g @ 0°, 5 @ 70° → 81.37 g @ 324.5°', () => {
		// Source: exact vector arithmetic of the single-plane influence-coefficient method (check value 81.37 g @ 324.5°).
		const w = toPolar(singlePlaneCorrection(polar(7, 160), polar(100, 0), polar(5, 70)));
		expect(w.amount).toBeCloseTo(81.37, 2);
		expect(w.angle).toBeCloseTo(324.5, 1);
	});

	test('two planes: Vaughan, Brüel & Kjær application note 17-227, table 2, example 6', () => {
		// Source: J. Vaughan, "Static and dynamic balancing using portable measuring equipment", B&K 17-227, table 2, example 6:
		// corrections 1.979 g @ 236.2° (plane 1) and 1.071 g @ 121.8° (plane 2).
		const [w1, w2] = twoPlaneCorrection(
			[polar(170, 112), polar(53, 78)],
			polar(1.15, 0),
			[polar(235, 94), polar(58, 68)],
			polar(1.15, 0),
			[polar(185, 115), polar(77, 104)]
		).map(toPolar);
		expect(w1.amount).toBeCloseTo(1.979, 3);
		expect(w1.angle).toBeCloseTo(236.2, 1);
		expect(w2.amount).toBeCloseTo(1.071, 3);
		expect(w2.angle).toBeCloseTo(121.8, 1);
	});

	test('removing material is the same mass 180° away', () => {
		// Source: common practice (removing mass at θ+180° equals adding it at θ).
		expect(asMode(polar(2, 30), 'remove').angle).toBeCloseTo(210, 9);
		expect(asMode(polar(2, 300), 'remove').angle).toBeCloseTo(120, 9);
		expect(asMode(polar(2, 300), 'add').amount).toBeCloseTo(2, 12);
	});

	test('splitting into the two nearest positions: 10 g @ 45° on 4 positions → 7.071 g at 0° and 90°', () => {
		// Source: vector decomposition by the law of sines (10·sin45°/sin90° = 7.071).
		const parts = splitToPositions(10, 45, 4);
		expect(parts.map((p) => p.angle)).toEqual([0, 90]);
		expect(parts[0].amount).toBeCloseTo(7.0711, 4);
		expect(parts[1].amount).toBeCloseTo(7.0711, 4);
		// 12 blades, offset 5°: 100 @ 20° sits between blade 0 (5°) and blade 1 (35°), halfway → equal parts of 100/(2·cos15°).
		const blades = splitToPositions(100, 20, 12, 5);
		expect(blades.map((p) => p.position)).toEqual([0, 1]);
		expect(blades[0].amount).toBeCloseTo(100 / (2 * Math.cos((15 * Math.PI) / 180)), 9);
		// On a position: one part.
		expect(splitToPositions(3, 90, 4)).toEqual([{ position: 1, angle: 90, amount: 3 }]);
		// Across 0°: 350° on 6 positions lies between 300° (position 5) and 0° (position 0).
		const wrap = splitToPositions(1, 350, 6);
		expect(wrap.map((p) => p.position)).toEqual([5, 0]);
		expect(abs(sub(sumParts(wrap), polar(1, 350)))).toBeLessThan(1e-12);
		expect(angleOf(polar(1, -10))).toBeCloseTo(350, 9);
	});

	test('trial runs that do not tell the planes apart are refused with a sentence', () => {
		// Source: a singular influence matrix has no inverse (linear algebra).
		expect(() =>
			twoPlaneCorrection([polar(1, 0), polar(1, 0)], polar(1, 0), [polar(2, 0), polar(2, 0)], polar(1, 0), [polar(2, 0), polar(2, 0)])
		).toThrow(/do not tell the planes apart/);
	});
});
