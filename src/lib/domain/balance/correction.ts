/**
 * Influence-coefficient balancing (the usual method of field and machine balancing):
 * a reading R is taken with the rotor as it is, and again with a known trial mass T added;
 * the influence coefficient H = (R_trial − R_initial) / T says how a mass changes the reading,
 * and the correction that cancels a reading R is W = −R / H (one plane) or W = −H⁻¹·R (two planes).
 * A correction can be made by adding mass at its angle or removing the same mass 180° away,
 * and split between the two nearest allowed positions (blades, drilling spots).
 */
import { finite, list, nonNegative, oneOf, result } from '../numbers';
import { add, checkComplex, div, mul, neg, polar, sub, toPolar, wrapDeg, abs, angleOf, type Complex, type Polar } from './complex';

const half = (z: Complex): Complex => ({ re: z.re / 2, im: z.im / 2 });

/** The largest power of two at or below |x| (x finite, not 0): scaling by it is exact. */
function pow2(x: number): number {
	return 2 ** Math.floor(Math.log2(Math.abs(x)));
}

function largestPart(zs: readonly Complex[]): number {
	let m = 0;
	for (const z of zs) m = Math.max(m, Math.abs(z.re), Math.abs(z.im));
	return m;
}

const scaleBy = (z: Complex, s: number): Complex => ({ re: z.re / s, im: z.im / s });

/** Influence coefficient of one plane on one reading. */
export function influence(initial: Complex, withTrial: Complex, trial: Complex): Complex {
	checkComplex('The initial reading', initial);
	checkComplex('The reading with the trial mass', withTrial);
	checkComplex('The trial mass', trial);
	if (trial.re === 0 && trial.im === 0) throw new RangeError('The trial mass must be more than 0.');
	const dre = withTrial.re - initial.re;
	const dim = withTrial.im - initial.im;
	// Readings of opposite sign near the double range: the difference overflows, half of it does not.
	if (Number.isFinite(dre) && Number.isFinite(dim)) return div({ re: dre, im: dim }, trial);
	return div(sub(half(withTrial), half(initial)), half(trial));
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
	if (!Array.isArray(h) || h.length !== 2 || !h.every((row) => Array.isArray(row) && row.length === 2)) {
		throw new RangeError('The influence matrix needs two rows of two coefficients.');
	}
	list<Complex>('The reading', reading);
	if (reading.length !== 2) throw new RangeError('The reading needs a value for each of the two planes.');
	const [[a0, b0], [c0, d0]] = h;
	checkComplex('Coefficient H11', a0);
	checkComplex('Coefficient H12', b0);
	checkComplex('Coefficient H21', c0);
	checkComplex('Coefficient H22', d0);
	checkComplex('The compressor-plane reading', reading[0]);
	checkComplex('The turbine-plane reading', reading[1]);
	// Scale the matrix and the reading by powers of two (exact) so that no product or determinant
	// overflows or underflows: W = (sR / sH) · H'⁻¹ · (−R'), with H' = H / sH and R' = R / sR.
	const mH = largestPart([a0, b0, c0, d0]);
	const sH = mH > 0 ? pow2(mH) : 1;
	const [a, b, cc, d] = [a0, b0, c0, d0].map((z) => scaleBy(z, sH));
	const det = sub(mul(a, d), mul(b, cc));
	// |det| < 1e-12 · max(1, |H11|·|H22|) in the original units, written in the scaled ones.
	if (abs(det) < 1e-12 * Math.max(1 / (sH * sH), abs(a) * abs(d))) {
		throw new RangeError('The trial runs do not tell the planes apart; use a larger trial mass or another position.');
	}
	const mR = largestPart(reading);
	const sR = mR > 0 ? pow2(mR) : 1;
	const r1 = neg(scaleBy(reading[0], sR));
	const r2 = neg(scaleBy(reading[1], sR));
	const w1 = div(sub(mul(d, r1), mul(b, r2)), det);
	const w2 = div(sub(mul(a, r2), mul(cc, r1)), det);
	const k = sR / sH;
	const back = (w: Complex): Complex => ({ re: result('The correction', Number.isFinite(k) ? w.re * k : (w.re * sR) / sH), im: result('The correction', Number.isFinite(k) ? w.im * k : (w.im * sR) / sH) });
	return [back(w1), back(w2)];
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
	oneOf('The correction mode', mode, ['add', 'remove'] as const);
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
	nonNegative('The correction amount', amount);
	finite('The correction angle', angle);
	finite('The angle of position 0', offsetDeg);
	if (!Number.isSafeInteger(count) || count < 3) throw new RangeError(`Splitting a correction needs a whole number of at least three positions (got ${count}).`);
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
	// The ratio of sines first: it is at most 1/sin(pitch), so the amount is not pushed past the double range on the way.
	const w1 = result('The first part of the correction', amount * (Math.sin(span - t) / Math.sin(span)));
	const w2 = result('The second part of the correction', amount * (Math.sin(t) / Math.sin(span)));
	if (w1 <= 1e-12) return [{ position: j, angle: a2, amount: w2 }];
	return [
		{ position: i, angle: a1, amount: w1 },
		{ position: j, angle: a2, amount: w2 }
	].filter((p) => p.amount > 1e-12);
}

/** Sum of split parts as one vector (for checks). */
export function sumParts(parts: readonly SplitPart[]): Complex {
	return list<SplitPart>('The parts', parts).reduce<Complex>((s, p) => add(s, polar(p.amount, p.angle)), { re: 0, im: 0 });
}

export { angleOf };
