/** Property tests of the balancing arithmetic against mathjs (complex numbers and lusolve) as the reference. */
import fc from 'fast-check';
import { complex, lusolve, divide, subtract, multiply, unaryMinus, add as madd, type Complex as MComplex } from 'mathjs';
import { expect, test } from 'vitest';
import { add, div, mul, polar, sub, abs, type Complex } from '../../src/lib/domain/balance/complex';
import { asMode, singlePlaneCorrection, splitToPositions, sumParts, twoPlaneCorrection } from '../../src/lib/domain/balance/correction';
import { toBearingPlanes } from '../../src/lib/domain/balance/allocation';

const vec = fc.record({ amount: fc.double({ min: 0.05, max: 500, noNaN: true }), angle: fc.double({ min: 0, max: 359.999, noNaN: true }) });
const toM = (z: Complex): MComplex => complex(z.re, z.im);
const close = (a: Complex, ref: MComplex | number, tol = 1e-7) => {
	// mathjs may hand back a plain number for a value with no imaginary part.
	const b = complex(ref as MComplex);
	const scaleBy = Math.max(1, Math.hypot(b.re, b.im));
	expect(Math.hypot(a.re - b.re, a.im - b.im) / scaleBy).toBeLessThan(tol);
};

test('complex arithmetic agrees with mathjs', () => {
	// Source: mathjs complex numbers as the reference implementation.
	fc.assert(
		fc.property(vec, vec, (p, q) => {
			const a = polar(p.amount, p.angle);
			const b = polar(q.amount, q.angle);
			close(add(a, b), madd(toM(a), toM(b)) as MComplex);
			close(sub(a, b), subtract(toM(a), toM(b)) as MComplex);
			close(mul(a, b), multiply(toM(a), toM(b)) as MComplex);
			close(div(a, b), divide(toM(a), toM(b)) as MComplex);
		}),
		{ numRuns: 300 }
	);
});

test('single-plane correction equals mathjs −R0·T/(R1−R0)', () => {
	// Source: mathjs complex division as the reference.
	fc.assert(
		fc.property(vec, vec, vec, (r0, t, r1) => {
			const R0 = polar(r0.amount, r0.angle);
			const T = polar(t.amount, t.angle);
			const R1 = polar(r1.amount, r1.angle);
			fc.pre(abs(sub(R1, R0)) > 1e-3);
			const ref = divide(multiply(unaryMinus(toM(R0)), toM(T)), subtract(toM(R1), toM(R0))) as MComplex;
			close(singlePlaneCorrection(R0, T, R1), ref);
		}),
		{ numRuns: 300 }
	);
});

test('two-plane correction equals mathjs lusolve(H, −R0)', () => {
	// Source: mathjs lusolve on the complex influence matrix as the reference.
	fc.assert(
		fc.property(fc.array(vec, { minLength: 8, maxLength: 8 }), (v) => {
			const z = v.map((p) => polar(p.amount, p.angle));
			const [a0, b0, t1, t2, a1, b1, a2, b2] = z;
			const h = [
				[divide(subtract(toM(a1), toM(a0)), toM(t1)), divide(subtract(toM(a2), toM(a0)), toM(t2))],
				[divide(subtract(toM(b1), toM(b0)), toM(t1)), divide(subtract(toM(b2), toM(b0)), toM(t2))]
			] as MComplex[][];
			const det = subtract(multiply(h[0][0], h[1][1]), multiply(h[0][1], h[1][0])) as MComplex;
			const normH = Math.max(...h.flat().map((x) => Math.hypot(x.re, x.im)));
			fc.pre(Math.hypot(det.re, det.im) > 1e-3 * normH * normH);
			const sol = lusolve(h, [[unaryMinus(toM(a0))], [unaryMinus(toM(b0))]]) as unknown as MComplex[][];
			const [w1, w2] = twoPlaneCorrection([a0, b0], t1, [a1, b1], t2, [a2, b2]);
			close(w1, sol[0][0], 1e-6);
			close(w2, sol[1][0], 1e-6);
		}),
		{ numRuns: 300 }
	);
});

test('adding the correction cancels the reading (linear model)', () => {
	// Source: the influence-coefficient model R = R0 + H·W, evaluated with mathjs.
	fc.assert(
		fc.property(vec, vec, vec, (r0, t, r1) => {
			const R0 = polar(r0.amount, r0.angle);
			const T = polar(t.amount, t.angle);
			const R1 = polar(r1.amount, r1.angle);
			fc.pre(abs(sub(R1, R0)) > 1e-3);
			const W = singlePlaneCorrection(R0, T, R1);
			const H = divide(subtract(toM(R1), toM(R0)), toM(T)) as MComplex;
			const after = madd(toM(R0), multiply(H, toM(W))) as MComplex;
			expect(Math.hypot(after.re, after.im)).toBeLessThan(1e-7 * Math.max(1, r0.amount));
			const removed = asMode(W, 'remove');
			close(polar(removed.amount, removed.angle), unaryMinus(toM(W)) as MComplex);
		}),
		{ numRuns: 200 }
	);
});

test('split parts are non-negative, at the two nearest positions, and add up to the correction', () => {
	// Source: vector sum checked with mathjs complex addition.
	fc.assert(
		fc.property(vec, fc.integer({ min: 3, max: 16 }), fc.double({ min: 0, max: 359, noNaN: true }), (w, n, offset) => {
			const parts = splitToPositions(w.amount, w.angle, n, offset);
			expect(parts.length).toBeGreaterThanOrEqual(1);
			expect(parts.length).toBeLessThanOrEqual(2);
			for (const p of parts) expect(p.amount).toBeGreaterThan(0);
			const ref = parts.reduce<MComplex>((s, p) => madd(s, toM(polar(p.amount, p.angle))) as MComplex, complex(0, 0));
			close(polar(w.amount, w.angle), ref, 1e-7);
			close(sumParts(parts), ref, 1e-9);
		}),
		{ numRuns: 300 }
	);
});

test('the transfer to the bearing planes keeps the resultant and its moment', () => {
	// Source: statics (sum of forces and of moments), solved with mathjs lusolve as the reference.
	fc.assert(
		fc.property(vec, vec, fc.integer({ min: 20, max: 60 }), fc.integer({ min: 61, max: 120 }), (a, b, z1, z2) => {
			const g = { bearingCompMm: z1, bearingTurbMm: z2, centreOfMassMm: (z1 + z2) / 2, planeCompMm: 5, planeTurbMm: 140 };
			const UA = polar(a.amount, a.angle);
			const UB = polar(b.amount, b.angle);
			const rhs = [[madd(toM(UA), toM(UB))], [madd(multiply(toM(UA), 5), multiply(toM(UB), 140))]];
			const sol = lusolve([[1, 1], [z1, z2]], rhs as unknown as MComplex[][]) as unknown as MComplex[][];
			const [u1, u2] = toBearingPlanes(g, UA, UB);
			close(u1, sol[0][0], 1e-7);
			close(u2, sol[1][0], 1e-7);
		}),
		{ numRuns: 200 }
	);
});
