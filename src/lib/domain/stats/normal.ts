/**
 * The standard normal distribution: its quantile function (inverse CDF).
 *
 * Rational approximation by P. J. Acklam (2003, "An algorithm for computing the inverse normal
 * cumulative distribution function"), relative error below 1.15e-9, refined with one Halley step
 * on an erfc evaluated by its continued fraction / series so the result is good to about 1e-15.
 */
import { finite } from '../numbers';

const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549671010224395, 4.374664141464968, 2.938163982698783];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

/** Complementary error function: series for small x, Lentz continued fraction for large x. */
export function erfc(x: number): number {
	finite('The argument of erfc', x);
	return erfcOf(x);
}

function erfcOf(x: number): number {
	if (x < 0) return 2 - erfcOf(-x);
	if (x < 2) {
		// erf(x) = 2/√π Σ (−1)^n x^(2n+1) / (n! (2n+1))
		let sum = x;
		let term = x;
		for (let n = 1; n < 200; n++) {
			term *= (-x * x) / n;
			const add = term / (2 * n + 1);
			sum += add;
			if (Math.abs(add) < 1e-17 * Math.abs(sum)) break;
		}
		return 1 - (2 / Math.sqrt(Math.PI)) * sum;
	}
	// erfc(x) = e^(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + ...)))))
	let f = x;
	let c = x;
	let d = 0;
	for (let n = 1; n < 500; n++) {
		const an = n / 2;
		d = x + an * d;
		d = d === 0 ? 1e-300 : 1 / d;
		c = x + an / c;
		if (c === 0) c = 1e-300;
		const delta = c * d;
		f *= delta;
		if (Math.abs(delta - 1) < 1e-16) break;
	}
	return Math.exp(-x * x) / (Math.sqrt(Math.PI) * f);
}

/** Φ(z), the standard normal CDF. */
export function normalCdf(z: number): number {
	finite('The z value', z);
	return 0.5 * erfcOf(-z / Math.SQRT2);
}

/** Φ⁻¹(p): the z with P(Z ≤ z) = p, for 0 < p < 1 (0 and 1 have no finite quantile). */
export function normalQuantile(p: number): number {
	finite('The probability', p);
	if (!(p > 0 && p < 1)) throw new RangeError(`The probability must be between 0 and 1, both excluded (got ${p}).`);
	let x: number;
	if (p < P_LOW) {
		const q = Math.sqrt(-2 * Math.log(p));
		x = (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
	} else if (p <= 1 - P_LOW) {
		const q = p - 0.5;
		const r = q * q;
		x = ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1);
	} else {
		const q = Math.sqrt(-2 * Math.log(1 - p));
		x = -(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
	}
	// One Halley step (Acklam's refinement).
	const e = normalCdf(x) - p;
	const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2);
	const refined = x - u / (1 + (x * u) / 2);
	// Far in the tails (p below about 1e-300) e^(x²/2) overflows: keep the rational approximation.
	return Number.isFinite(refined) ? refined : x;
}

/** The two-sided critical value for a confidence level, e.g. 0.95 → 1.959964. */
const zMemo = new Map<number, number>();
export function zFor(confidence: number): number {
	finite('The confidence level', confidence);
	if (!(confidence > 0 && confidence < 1)) throw new RangeError(`The confidence level must be between 0 and 1, both excluded (got ${confidence}).`);
	let z = zMemo.get(confidence);
	if (z === undefined) {
		z = normalQuantile(1 - (1 - confidence) / 2);
		if (zMemo.size < 64) zMemo.set(confidence, z);
	}
	return z;
}
