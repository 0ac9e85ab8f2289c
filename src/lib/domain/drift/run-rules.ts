/**
 * Run rules for a control chart (the Western Electric rules as the NIST/SEMATECH e-Handbook
 * §6.3.2 lists them — from memory): a signal when
 *   1. one point is beyond 3σ from the centre line;
 *   2. two of three points in a row are beyond 2σ on the same side;
 *   3. four of five points in a row are beyond 1σ on the same side;
 *   4. eight points in a row are on the same side of the centre line.
 * Each hit names the rule, the side and the point (index) at which it first fires; a run keeps
 * firing on later points, but only its first point is reported per stretch.
 */
import { checkValues } from './individuals';

export type RuleId = 'beyond-3s' | 'two-of-three-2s' | 'four-of-five-1s' | 'eight-one-side';
export type Side = 'above' | 'below';

export interface RuleHit {
	rule: RuleId;
	side: Side;
	/** Index of the point where the rule fires (the last point of the pattern). */
	at: number;
	/** Index of the first point of the pattern. */
	from: number;
	/** Index of the last point at which the rule still fires (the stretch it covers ends here). */
	to: number;
}

export const RULE_WORDS: Record<RuleId, string> = {
	'beyond-3s': 'a point beyond the control limit',
	'two-of-three-2s': 'two of three points beyond two sigma',
	'four-of-five-1s': 'four of five points beyond one sigma',
	'eight-one-side': 'eight in a row on one side of the centre line'
};

export function runRules(xs: readonly number[], centre: number, sigma: number): RuleHit[] {
	checkValues(xs);
	if (!Number.isFinite(centre) || !Number.isFinite(sigma) || sigma < 0) throw new RangeError('The centre line and sigma must be finite numbers, sigma not negative.');
	const hits: RuleHit[] = [];
	const z = xs.map((x) => (sigma > 0 ? (x - centre) / sigma : x > centre ? Infinity : x < centre ? -Infinity : 0));
	const firing = new Map<string, RuleHit | null>();
	const mark = (rule: RuleId, side: Side, at: number, from: number, on: boolean) => {
		const key = `${rule}:${side}`;
		const open = firing.get(key) ?? null;
		if (on && open) open.to = at;
		else if (on) {
			const hit = { rule, side, at, from, to: at };
			hits.push(hit);
			firing.set(key, hit);
		} else firing.set(key, null);
	};
	for (let i = 0; i < z.length; i++) {
		for (const side of ['above', 'below'] as const) {
			const s = side === 'above' ? 1 : -1;
			const beyond = (k: number, j: number) => s * z[j] > k;
			mark('beyond-3s', side, i, i, beyond(3, i));
			const count = (len: number, k: number) => {
				if (i < len - 1) return false;
				let c = 0;
				for (let j = i - len + 1; j <= i; j++) if (beyond(k, j)) c += 1;
				return c;
			};
			const c23 = count(3, 2);
			mark('two-of-three-2s', side, i, i - 2, c23 !== false && c23 >= 2 && beyond(2, i));
			const c45 = count(5, 1);
			mark('four-of-five-1s', side, i, i - 4, c45 !== false && c45 >= 4 && beyond(1, i));
			let run = 0;
			for (let j = i; j >= 0 && s * z[j] > 0; j--) run += 1;
			mark('eight-one-side', side, i, i - 7, run >= 8);
		}
	}
	return hits.sort((a, b) => a.at - b.at);
}
