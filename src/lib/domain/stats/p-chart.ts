/**
 * The p-chart (fraction nonconforming) for samples of unequal size: one centre line
 * p̄ = Σ defectives / Σ inspected, and per-sample limits p̄ ± k·√(p̄(1−p̄)/nᵢ), the lower
 * floored at 0 and the upper capped at 1 (NIST/SEMATECH e-Handbook §6.3.3.2; Montgomery,
 * Introduction to Statistical Quality Control, §7.2.2 "variable sample size").
 */

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

export function pChartLimits(pBar: number, n: number, k = 3): PChartLimits {
	if (n <= 0) return { centre: pBar, lcl: 0, ucl: 1 };
	const sigma = Math.sqrt((pBar * (1 - pBar)) / n);
	return { centre: pBar, lcl: Math.max(0, pBar - k * sigma), ucl: Math.min(1, pBar + k * sigma) };
}

export function pBar(samples: readonly PChartSample[]): number | null {
	let n = 0;
	let d = 0;
	for (const s of samples) {
		n += s.n;
		d += s.defects;
	}
	return n ? d / n : null;
}

export type PChartSignal = 'above' | 'below' | 'within' | 'none';

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
	const centre = standard === undefined ? pBar(samples) : standard;
	return {
		pBar: centre,
		points: samples.map((s) => {
			if (centre === null || s.n === 0) return { centre: centre ?? 0, lcl: 0, ucl: 1, p: null, signal: 'none' as const };
			const lim = pChartLimits(centre, s.n, k);
			const p = s.defects / s.n;
			const signal: PChartSignal = p > lim.ucl ? 'above' : p < lim.lcl ? 'below' : 'within';
			return { ...lim, p, signal };
		})
	};
}
