/**
 * A small complex-number toolkit for balancing vectors (amount and angle). Angles are in
 * degrees, measured in the same sense as the balancing machine's angle scale.
 *
 * Every input must be finite, and a result that does not fit in a double is refused with a
 * RangeError rather than handed on as Infinity or NaN. Division scales before it divides
 * (Smith 1962, "Algorithm 116: Complex division", Communications of the ACM 5(8):435), and the
 * magnitude is Math.hypot, so readings near the top of the double range (1e200 and beyond)
 * still give the right answer.
 */
import { finite, nonNegative, result } from '../numbers';

export interface Complex {
	re: number;
	im: number;
}

const RAD = Math.PI / 180;

/** A vector whose parts are finite numbers; `name` says which vector in the message. */
export function checkComplex(name: string, a: Complex): Complex {
	if (typeof a !== 'object' || a === null) throw new RangeError(`${name} must be a vector (got ${a === null ? 'nothing' : typeof a}).`);
	finite(`${name} (real part)`, a.re);
	finite(`${name} (imaginary part)`, a.im);
	return a;
}

function out(what: string, re: number, im: number): Complex {
	return { re: result(what, re), im: result(what, im) };
}

export const c = (re: number, im = 0): Complex => {
	finite('The real part', re);
	finite('The imaginary part', im);
	return { re, im };
};

export function add(a: Complex, b: Complex): Complex {
	checkComplex('The first vector', a);
	checkComplex('The second vector', b);
	return out('The sum of the vectors', a.re + b.re, a.im + b.im);
}

export function sub(a: Complex, b: Complex): Complex {
	checkComplex('The first vector', a);
	checkComplex('The second vector', b);
	return out('The difference of the vectors', a.re - b.re, a.im - b.im);
}

export function mul(a: Complex, b: Complex): Complex {
	checkComplex('The first vector', a);
	checkComplex('The second vector', b);
	// Each product is finite or overflows honestly; a sum of two overflowed terms is refused.
	return out('The product of the vectors', a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
}

export function neg(a: Complex): Complex {
	checkComplex('The vector', a);
	return { re: -a.re, im: -a.im };
}

export function scale(a: Complex, k: number): Complex {
	checkComplex('The vector', a);
	finite('The scale factor', k);
	return out('The scaled vector', a.re * k, a.im * k);
}

/**
 * a / b by Smith's algorithm: divide through by the larger part of b first, so that neither
 * |b|² nor the cross products overflow or underflow for large or small readings. When the
 * ratio underflows to 0, the products are regrouped (Stewart 1985, "A note on complex
 * division", ACM TOMS 11(3):238–241).
 */
function smith(a: Complex, b: Complex): Complex {
	if (Math.abs(b.im) <= Math.abs(b.re)) {
		const r = b.im / b.re;
		const d = b.re + b.im * r;
		if (r === 0) return { re: (a.re + b.im * (a.im / b.re)) / d, im: (a.im - b.im * (a.re / b.re)) / d };
		return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
	}
	const r = b.re / b.im;
	const d = b.im + b.re * r;
	if (r === 0) return { re: (b.re * (a.re / b.im) + a.im) / d, im: (b.re * (a.im / b.im) - a.re) / d };
	return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

export function div(a: Complex, b: Complex): Complex {
	checkComplex('The dividend', a);
	checkComplex('The divisor', b);
	if (b.re === 0 && b.im === 0) throw new RangeError('Cannot divide by a zero vector.');
	let q = smith(a, b);
	if (!Number.isFinite(q.re) || !Number.isFinite(q.im)) {
		// A sum of two parts of the largest size overflowed on the way: halve the dividend (exact) and double back.
		const h = smith({ re: a.re / 2, im: a.im / 2 }, b);
		q = { re: h.re * 2, im: h.im * 2 };
	}
	return out('The quotient of the vectors', q.re, q.im);
}

export function abs(a: Complex): number {
	checkComplex('The vector', a);
	return result('The length of the vector', Math.hypot(a.re, a.im));
}

/** Angle in degrees, 0 ≤ angle < 360. */
export function angleOf(a: Complex): number {
	checkComplex('The vector', a);
	const deg = Math.atan2(a.im, a.re) / RAD;
	const n = ((deg % 360) + 360) % 360;
	return n >= 360 - 1e-12 ? 0 : n;
}

/** A vector from amount (0 or more) and angle in degrees. */
export function polar(amount: number, angleDeg: number): Complex {
	nonNegative('The amount', amount);
	finite('The angle', angleDeg);
	return { re: amount * Math.cos(angleDeg * RAD), im: amount * Math.sin(angleDeg * RAD) };
}

export interface Polar {
	amount: number;
	angle: number;
}

export const toPolar = (a: Complex): Polar => ({ amount: abs(a), angle: angleOf(a) });

/** Normalise an angle in degrees to 0 ≤ angle < 360. */
export function wrapDeg(angle: number): number {
	finite('The angle', angle);
	const n = ((angle % 360) + 360) % 360;
	return n >= 360 - 1e-12 ? 0 : n;
}
