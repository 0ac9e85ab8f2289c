/**
 * The p-chart (fraction nonconforming) for samples of unequal size: one centre line
 * p̄ = Σ defectives / Σ inspected, and per-sample limits p̄ ± k·√(p̄(1−p̄)/nᵢ), the lower
 * floored at 0 and the upper capped at 1 (NIST/SEMATECH e-Handbook §6.3.3.2; Montgomery,
 * Introduction to Statistical Quality Control, §7.2.2 "variable sample size").
 *
 * The limits lean on the normal approximation to the binomial, which needs enough expected
 * defectives per sample. Textbook rules ask for n·p ≥ 5 or similar (several are compared by
 * Emura & Lin 2015, "A comparison of normal approximation rules for attribute control charts",
 * Quality and Reliability Engineering International 31(3):411–418). A lot whose expected
 * scrap n·p̄ is below one core (MIN_EXPECTED_DEFECTS, common practice) is reported as too few
 * to judge: its 3-sigma limits would call one scrapped core "above" and none "within" by
 * chance alone.
 */
import { atMost, fraction, list, nonNegativeInt, positive, positiveInt, result } from '../numbers';

export interface PChartSample {
	/** Units judged in this sample (the lot's verdicts). */
	n: number;
	/** Of which nonconforming (scrapped). */
	defects: number;
}

export interface PChartLimits {
	centre: number;
	lcl: number;
	ucl: number;
}

/** Below this many expected defectives (n·p̄) a sample is too small for its limits to mean anything. */
export const MIN_EXPECTED_DEFECTS = 1;

export function pChartLimits(pBar: number, n: number, k = 3): PChartLimits {
	fraction('The centre line p̄', pBar);
	positiveInt('The sample size', n);
	positive('The width of the limits in sigmas', k);
	const sigma = Math.sqrt((pBar * (1 - pBar)) / n);
	const spread = result('The width of the control limits', k * sigma);
	return { centre: pBar, lcl: Math.max(0, pBar - spread), ucl: Math.min(1, pBar + spread) };
}

/** A sample's counts, checked: whole numbers, and no more scrapped than judged. */
export function checkSample(s: PChartSample): PChartSample {
	if (typeof s !== 'object' || s === null) throw new RangeError('A p-chart sample needs its counts (cores judged and scrapped).');
	nonNegativeInt('Cores judged', s.n);
	nonNegativeInt('Scrapped cores', s.defects);
	atMost('Scrapped cores', s.defects, 'Cores judged', s.n);
	return s;
}

export function pBar(samples: readonly PChartSample[]): number | null {
	let n = 0;
	let d = 0;
	for (const s of list<PChartSample>('The p-chart samples', samples)) {
		checkSample(s);
		n += s.n;
		d += s.defects;
	}
	return n ? d / n : null;
}

/**
 * `above` / `below`: outside the limits; `within`: inside them; `too_few`: n·p̄ below
 * MIN_EXPECTED_DEFECTS, so the limits say nothing about the lot; `none`: no verdicts (or no
 * centre line) to judge.
 */
export type PChartSignal = 'above' | 'below' | 'within' | 'too_few' | 'none';

/** The signal in words, for tables, exports and screen readers. */
export const PCHART_SIGNAL_LABEL: Record<PChartSignal, string> = {
	above: 'Above the upper control limit',
	below: 'Below the lower control limit',
	within: 'Within control limits',
	too_few: 'Too few cores to judge',
	none: 'No verdicts yet'
};

export interface PChartPoint extends PChartLimits {
	p: number | null;
	signal: PChartSignal;
}

/**
 * Limits and the signal for each sample, in the order given (time order for a control chart).
 * The centre line is p̄ of these samples unless a standard `centre` is given (e.g. the whole
 * shop's rate when only one supplier's lots are charted).
 */
export function pChart(samples: readonly PChartSample[], k = 3, standard?: number | null): { pBar: number | null; points: PChartPoint[] } {
	positive('The width of the limits in sigmas', k);
	if (standard !== undefined && standard !== null) fraction('The standard centre line', standard);
	const centre = standard === undefined ? pBar(samples) : (list<PChartSample>('The p-chart samples', samples).forEach(checkSample), standard);
	return {
		pBar: centre,
		points: samples.map((s) => {
			if (centre === null || s.n === 0) return { centre: centre ?? 0, lcl: 0, ucl: 1, p: null, signal: 'none' as const };
			const lim = pChartLimits(centre, s.n, k);
			const p = s.defects / s.n;
			if (s.n * centre < MIN_EXPECTED_DEFECTS) return { ...lim, p, signal: 'too_few' as const };
			const signal: PChartSignal = p > lim.ucl ? 'above' : p < lim.lcl ? 'below' : 'within';
			return { ...lim, p, signal };
		})
	};
}
