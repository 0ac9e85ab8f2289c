/**
 * Whether the balancing machine drifts: for every balanced build, the residual unbalance left
 * after correction as a share of the plane's allowance (1 = at the limit), per plane in time
 * order, on an individuals chart (individuals.ts) with the run rules (run-rules.ts). A balancer
 * that drifts, or an arbor that wears, pushes the shares up run after run before a unit ships
 * close to its limit.
 */
import { individualsChart, type IndividualsChart } from './individuals';
import { RULE_WORDS, runRules, type RuleHit } from './run-rules';
import { finiteResult, result } from '../numbers';

export const PLANES = ['comp', 'turb'] as const;
export type Plane = (typeof PLANES)[number];
export const PLANE_WORDS: Record<Plane, string> = { comp: 'compressor plane', turb: 'turbine plane' };

export function shareOfAllowance(residualGmm: number, tolGmm: number): number {
	if (typeof residualGmm !== 'number' || !Number.isFinite(residualGmm) || residualGmm < 0) throw new RangeError(`A residual unbalance must be a number of g·mm, 0 or more (got ${String(residualGmm)}).`);
	if (typeof tolGmm !== 'number' || !Number.isFinite(tolGmm) || tolGmm <= 0) throw new RangeError(`An allowance must be a positive number of g·mm (got ${String(tolGmm)}).`);
	return result('The share of the allowance', residualGmm / tolGmm);
}

export interface PlaneDrift {
	plane: Plane;
	chart: IndividualsChart | null;
	hits: RuleHit[];
	/** Hits that reach the latest point's stretch: what is happening now. */
	current: RuleHit[];
	/** The largest share in view. */
	worst: number | null;
}

export interface DriftVerdict {
	planes: PlaneDrift[];
	drifting: boolean;
	/** In plain words, naming the plane, the rule and where the run starts. */
	sentence: string;
}

/** A hit counts as current when the rule still fired within the last `recent` points. */
export function planeDrift(plane: Plane, shares: readonly number[], recent = 8): PlaneDrift {
	const chart = individualsChart(shares);
	const hits = chart ? runRules(shares, chart.centre, chart.sigma) : [];
	const last = shares.length - 1;
	const current = hits.filter((h) => h.to > last - recent);
	return finiteResult('The drift of a plane', { plane, chart, hits, current, worst: shares.length ? Math.max(...shares) : null });
}

export function driftVerdict(series: Record<Plane, readonly number[]>, labels: readonly string[] = []): DriftVerdict {
	const planes = PLANES.map((p) => planeDrift(p, series[p]));
	const n = series.comp.length;
	if (n < 2) return { planes, drifting: false, sentence: `Too few balanced units to judge the balancer (${n}); it needs at least 2.` };
	const upward = planes.flatMap((p) => p.current.filter((h) => h.side === 'above').map((h) => ({ p, h })));
	if (upward.length === 0) return { planes, drifting: false, sentence: `No drift: the residual shares of the last ${n} balanced units break no run rule upward.` };
	const { p, h } = upward[0];
	const from = labels[h.from] ? ` from ${labels[h.from]}` : '';
	return { planes, drifting: true, sentence: `The balancer may be drifting: ${RULE_WORDS[h.rule]} (above) in the ${PLANE_WORDS[p.plane]}${from}. Check the machine's calibration and the arbor before the next unit.` };
}
