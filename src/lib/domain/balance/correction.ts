/**
 * Influence-coefficient balancing (the usual method of field and machine balancing):
 * a reading R is taken with the rotor as it is, and again with a known trial mass T added;
 * the influence coefficient H = (R_trial − R_initial) / T says how a mass changes the reading,
 * and the correction that cancels a reading R is W = −R / H (one plane) or W = −H⁻¹·R (two planes).
 * A correction can be made by adding mass at its angle or removing the same mass 180° away,
 * and split between the two nearest allowed positions (blades, drilling spots).
 */
import { add, div, mul, neg, polar, sub, toPolar, wrapDeg, abs, angleOf, type Complex, type Polar } from './complex';

/** Influence coefficient of one plane on one reading. */
export function influence(initial: Complex, withTrial: Complex, trial: Complex): Complex {
	return div(sub(withTrial, initial), trial);
}

/** Single-plane correction from the initial run and one trial run. */
export function singlePlaneCorrection(initial: Complex, trial: Complex, withTrial: Complex): Complex {
	return div(neg(initial), influence(initial, withTrial, trial));
}

/** 2×2 influence matrix [[H11, H12], [H21, H22]]: Hij is the effect of a mass in plane j on reading i. */
export type Matrix2 = [[Complex, Complex], [Complex, Complex]];

export function influenceMatrix(
	initial: [Complex, Complex],
	trial1: Complex,
	run1: [Complex, Complex],
	trial2: Complex,
	run2: [Complex, Complex]
): Matrix2 {
	return [
		[influence(initial[0], run1[0], trial1), influence(initial[0], run2[0], trial2)],
		[influence(initial[1], run1[1], trial1), influence(initial[1], run2[1], trial2)]
	];
}

/** Solve H·W = −R for W (Cramer's rule). */
export function solveCorrection(h: Matrix2, reading: [Complex, Complex]): [Complex, Complex] {
	const [[a, b], [cc, d]] = h;
	const det = sub(mul(a, d), mul(b, cc));
	if (abs(det) < 1e-12 * Math.max(1, abs(a) * abs(d))) {
		throw new RangeError('the trial runs do not tell the planes apart; use a larger trial mass or another position');
	}
	const r1 = neg(reading[0]);
	const r2 = neg(reading[1]);
	return [div(sub(mul(d, r1), mul(b, r2)), det), div(sub(mul(a, r2), mul(cc, r1)), det)];
}

/** Two-plane correction from the initial run and one trial run per plane. */
export function twoPlaneCorrection(
	initial: [Complex, Complex],
	trial1: Complex,
	run1: [Complex, Complex],
	trial2: Complex,
	run2: [Complex, Complex]
): [Complex, Complex] {
	return solveCorrection(influenceMatrix(initial, trial1, run1, trial2, run2), initial);
}

export type CorrectionMode = 'add' | 'remove';

/** The correction as a mass to add at its angle, or the same mass to remove 180° away. */
export function asMode(w: Complex, mode: CorrectionMode): Polar {
	const p = toPolar(w);
	return mode === 'add' ? p : { amount: p.amount, angle: wrapDeg(p.angle + 180) };
}

export interface SplitPart {
	position: number;
	angle: number;
	amount: number;
}

/**
 * Split a correction `amount ∠ angle` between the two nearest of `count` equally spaced
 * positions (position 0 at `offsetDeg`, numbered in the sense of the angle scale), so that
 * the two parts add up to the original vector. Angles in degrees.
 */
export function splitToPositions(amount: number, angle: number, count: number, offsetDeg = 0): SplitPart[] {
	if (!Number.isInteger(count) || count < 3) throw new RangeError('need at least three positions to split a correction');
	const pitch = 360 / count;
	const rel = wrapDeg(angle - offsetDeg);
	let i = Math.floor(rel / pitch + 1e-9) % count;
	const a1 = wrapDeg(offsetDeg + i * pitch);
	const within = wrapDeg(angle - a1);
	if (within < 1e-9 || Math.abs(within - 360) < 1e-9) return [{ position: i, angle: a1, amount }];
	const j = (i + 1) % count;
	const a2 = wrapDeg(offsetDeg + j * pitch);
	const span = (pitch * Math.PI) / 180;
	const t = (within * Math.PI) / 180;
	// Law of sines: the parts along a1 and a2 that add to the vector.
	const w1 = (amount * Math.sin(span - t)) / Math.sin(span);
	const w2 = (amount * Math.sin(t)) / Math.sin(span);
	if (w1 <= 1e-12) return [{ position: j, angle: a2, amount: w2 }];
	return [
		{ position: i, angle: a1, amount: w1 },
		{ position: j, angle: a2, amount: w2 }
	].filter((p) => p.amount > 1e-12);
}

/** Sum of split parts as one vector (for checks). */
export function sumParts(parts: readonly SplitPart[]): Complex {
	return parts.reduce<Complex>((s, p) => add(s, polar(p.amount, p.angle)), { re: 0, im: 0 });
}

export { angleOf };
