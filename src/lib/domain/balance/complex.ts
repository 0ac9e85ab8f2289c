/**
 * A small complex-number toolkit for balancing vectors (amount and angle). Angles are in
 * degrees, measured in the same sense as the balancing machine's angle scale.
 */
export interface Complex {
	re: number;
	im: number;
}

const RAD = Math.PI / 180;

export const c = (re: number, im = 0): Complex => ({ re, im });
export const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
export const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
export const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
export const neg = (a: Complex): Complex => ({ re: -a.re, im: -a.im });
export const scale = (a: Complex, k: number): Complex => ({ re: a.re * k, im: a.im * k });

export function div(a: Complex, b: Complex): Complex {
	const d = b.re * b.re + b.im * b.im;
	if (d === 0) throw new RangeError('division by a zero vector');
	return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

export const abs = (a: Complex): number => Math.hypot(a.re, a.im);

/** Angle in degrees, 0 ≤ angle < 360. */
export function angleOf(a: Complex): number {
	const deg = Math.atan2(a.im, a.re) / RAD;
	const n = ((deg % 360) + 360) % 360;
	return n >= 360 - 1e-12 ? 0 : n;
}

/** A vector from amount and angle in degrees. */
export function polar(amount: number, angleDeg: number): Complex {
	return { re: amount * Math.cos(angleDeg * RAD), im: amount * Math.sin(angleDeg * RAD) };
}

export interface Polar {
	amount: number;
	angle: number;
}

export const toPolar = (a: Complex): Polar => ({ amount: abs(a), angle: angleOf(a) });

/** Normalise an angle in degrees to 0 ≤ angle < 360. */
export function wrapDeg(angle: number): number {
	const n = ((angle % 360) + 360) % 360;
	return n >= 360 - 1e-12 ? 0 : n;
}
