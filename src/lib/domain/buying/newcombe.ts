/**
 * The difference of two proportions with its interval by Newcombe's hybrid score method
 * (Newcombe 1998, "Interval estimation for the difference between independent proportions:
 * comparison of eleven methods", Statistics in Medicine 17:873–890, method 10, no continuity
 * correction): with Wilson score limits (l₁, u₁) and (l₂, u₂) of p₁ = x₁/n₁ and p₂ = x₂/n₂,
 *   L = (p₁ − p₂) − √((p₁ − l₁)² + (u₂ − p₂)²)
 *   U = (p₁ − p₂) + √((u₁ − p₁)² + (p₂ − l₂)²).
 * It stays inside [−1, 1], behaves at 0/n, and its coverage is close to nominal for small n.
 */
import { wilsonInterval } from '../stats/proportion';
import { checkConfidence, checkProportion } from './checks';
import { finite, result } from '../numbers';

export interface ProportionSide {
	x: number;
	n: number;
	p: number;
	low: number;
	high: number;
}

export interface Difference {
	a: ProportionSide;
	b: ProportionSide;
	/** p_a − p_b */
	diff: number;
	low: number;
	high: number;
	confidence: number;
}

function side(x: number, n: number, confidence: number): ProportionSide {
	const ci = wilsonInterval(x, n, confidence)!;
	return { x, n, p: x / n, low: ci.low, high: ci.high };
}

/** p₁ − p₂ with its interval; null when either side has no trials yet. */
export function newcombeDifference(x1: number, n1: number, x2: number, n2: number, confidence = 0.95): Difference | null {
	checkProportion('scrapped cores', x1, n1);
	checkProportion('scrapped cores', x2, n2);
	checkConfidence(confidence);
	if (n1 === 0 || n2 === 0) return null;
	const a = side(x1, n1, confidence);
	const b = side(x2, n2, confidence);
	const diff = a.p - b.p;
	const low = diff - Math.sqrt((a.p - a.low) ** 2 + (b.high - b.p) ** 2);
	const high = diff + Math.sqrt((a.high - a.p) ** 2 + (b.p - b.low) ** 2);
	return { a, b, diff, low: Math.max(-1, low), high: Math.min(1, high), confidence };
}

/** Percentage points, whole above one point, one decimal below. */
export function points(v: number): string {
	finite('A difference in points', v);
	const p = result('A difference in points', Math.abs(v * 100));
	return p >= 1 ? String(Math.round(p)) : p.toFixed(1);
}

/**
 * The comparison in words. A difference is claimed only when the interval leaves out zero:
 * "Ninemile scraps more than Pellworth: 24 to 41 points more."
 */
export function differenceSentence(nameA: string, nameB: string, d: Difference | null, verb = 'scraps'): string {
	if (!d) return `Not enough cores to tell: ${nameA} and ${nameB} both need cores with a verdict.`;
	const level = `${Math.round(d.confidence * 100)} %`;
	if (d.low > 0) return `${nameA} ${verb} more than ${nameB}: ${points(d.low)} to ${points(d.high)} points more (${level} interval).`;
	if (d.high < 0) return `${nameA} ${verb} less than ${nameB}: ${points(d.high)} to ${points(d.low)} points less (${level} interval).`;
	return `Not enough cores to tell ${nameA} and ${nameB} apart: the difference runs from ${points(d.low)} points less to ${points(d.high)} points more (${level} interval).`;
}
