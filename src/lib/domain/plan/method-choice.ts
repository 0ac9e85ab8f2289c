/**
 * Which smoothing follows a model's weekly demand better, and how far to trust its forecast.
 *
 * - Each method is compared at the constants that minimise its mean squared one-week-ahead
 *   error on the history: single smoothing (ses.ts, NIST/SEMATECH §6.4.3.1) over α = 0.01 … 1;
 *   double smoothing with a trend (holt.ts, §6.4.3.3) over a grid of 0.02 steps of
 *   (0, 1] × [0, 1], then a 0.005 grid around the best point. The chosen values are returned.
 * - Both are judged on the same weeks: from week 5 on, after the four weeks the trend's
 *   starting value reads, so neither is scored on data its start already saw.
 * - The trend method is used only when its error there is at least 10 % below single
 *   smoothing's (our rule: it fits one constant more to the same short history, so a smaller
 *   edge is not worth the extra wobble), and needs 6 weeks of history.
 * - When single smoothing is used, it runs with the owner's α (the shop's setting); its best
 *   α on the history is returned beside it as a hint.
 * - Trust: the mean absolute error, in units, of the used method's past one-week-ahead
 *   forecasts over those weeks ("forecasts like this were off by about 3 units a week").
 */
import { holt, type HoltResult } from './holt';
import { ses } from './ses';

export const FIRST_SCORED_WEEK = 5;
export const MIN_WEEKS_FOR_TREND = 6;
export const TREND_EDGE = 0.1;

export type Method = 'single' | 'trend';

export interface MethodScore {
	/** Mean squared one-week-ahead error over the scored weeks. */
	mse: number | null;
	/** Mean absolute one-week-ahead error, in units. */
	mae: number | null;
	/** Next week's forecast, never below 0. */
	next: number;
	/** One-week-ahead forecasts aligned with the history (null where there is none). */
	forecasts: (number | null)[];
}

export interface MethodChoice {
	/** Single smoothing at the owner's α: what the plan uses when single smoothing is chosen. */
	single: MethodScore & { alpha: number };
	/** Single smoothing at its best α on the history: what the trend method is compared with. */
	bestSingle: MethodScore & { alpha: number };
	trend: (MethodScore & { alpha: number; gamma: number }) | null;
	method: Method;
	/** How many weeks both were scored on. */
	scoredWeeks: number;
	forecast: number;
	/** The chosen method's mean absolute error in units; null when nothing could be scored. */
	trust: number | null;
	/** In plain words: which method, and why. */
	why: string;
}

function score(history: readonly number[], forecasts: readonly (number | null)[]): { mse: number | null; mae: number | null } {
	let sq = 0;
	let abs = 0;
	let k = 0;
	for (let i = FIRST_SCORED_WEEK - 1; i < history.length; i++) {
		const f = forecasts[i];
		if (f === null || f === undefined) continue;
		const e = history[i] - f;
		sq += e * e;
		abs += Math.abs(e);
		k += 1;
	}
	return k ? { mse: sq / k, mae: abs / k } : { mse: null, mae: null };
}

function scoredMse(history: readonly number[], fit: HoltResult): number {
	return score(history, fit.forecasts).mse ?? Number.POSITIVE_INFINITY;
}

/** α and γ of double smoothing that minimise the one-week-ahead squared error on the scored weeks. */
export function fitHolt(history: readonly number[]): HoltResult {
	let best = holt(history, 0.5, 0.5);
	let bestErr = scoredMse(history, best);
	const tryAt = (a: number, g: number) => {
		if (a <= 0 || a > 1 || g < 0 || g > 1) return;
		const fit = holt(history, a, g);
		const err = scoredMse(history, fit);
		if (err < bestErr - 1e-12) {
			best = fit;
			bestErr = err;
		}
	};
	for (let i = 1; i <= 50; i++) for (let j = 0; j <= 50; j++) tryAt(i / 50, j / 50);
	const a0 = best.alpha;
	const g0 = best.gamma;
	for (let i = -4; i <= 4; i++) for (let j = -4; j <= 4; j++) tryAt(Math.round((a0 + i * 0.005) * 1000) / 1000, Math.round((g0 + j * 0.005) * 1000) / 1000);
	return best;
}

/** α of single smoothing that minimises the one-week-ahead squared error on the scored weeks. */
export function fitSesAlpha(history: readonly number[]): number {
	let best = 1;
	let bestErr = Number.POSITIVE_INFINITY;
	for (let i = 1; i <= 100; i++) {
		const a = i / 100;
		const err = score(history, ses(history, a).smoothed).mse ?? Number.POSITIVE_INFINITY;
		if (err < bestErr - 1e-12) {
			best = a;
			bestErr = err;
		}
	}
	return best;
}

const units = (v: number) => (v >= 10 ? v.toFixed(0) : v.toFixed(1));

export function chooseMethod(history: readonly number[], sesAlpha: number): MethodChoice {
	const s = ses(history, sesAlpha);
	const single = { alpha: sesAlpha, ...score(history, s.smoothed), next: Math.max(0, s.next ?? 0), forecasts: s.smoothed };
	const scoredWeeks = Math.max(0, history.length - (FIRST_SCORED_WEEK - 1));
	const bestAlpha = history.length > FIRST_SCORED_WEEK - 1 ? fitSesAlpha(history) : sesAlpha;
	const b = ses(history, bestAlpha);
	const bestSingle = { alpha: bestAlpha, ...score(history, b.smoothed), next: Math.max(0, b.next ?? 0), forecasts: b.smoothed };
	if (history.length < MIN_WEEKS_FOR_TREND) {
		return {
			single,
			bestSingle,
			trend: null,
			method: 'single',
			scoredWeeks,
			forecast: single.next,
			trust: single.mae,
			why: `Single smoothing: ${history.length} weeks of history are too few to fit a trend (it needs ${MIN_WEEKS_FOR_TREND}).`
		};
	}
	const h = fitHolt(history);
	const trend = { alpha: h.alpha, gamma: h.gamma, ...score(history, h.forecasts), next: Math.max(0, h.next ?? 0), forecasts: h.forecasts };
	const useTrend = trend.mse !== null && bestSingle.mse !== null && bestSingle.mse > 0 && trend.mse <= (1 - TREND_EDGE) * bestSingle.mse;
	const chosen = useTrend ? trend : single;
	const why = useTrend
		? `Trend smoothing follows this model better: its one-week-ahead forecasts over the last ${scoredWeeks} weeks were off by ${units(trend.mae!)} units a week on average, single smoothing's by ${units(bestSingle.mae!)} at best.`
		: trend.mse !== null && bestSingle.mse !== null && trend.mse < bestSingle.mse
			? `Single smoothing: the trend method's squared error was only ${Math.round((1 - trend.mse / bestSingle.mse) * 100)} % smaller (off by ${units(trend.mae!)} against ${units(bestSingle.mae!)} units a week), not the ${Math.round(TREND_EDGE * 100)} % it needs to be preferred.`
			: `Single smoothing follows this model as well or better: off by ${units(bestSingle.mae ?? 0)} units a week at best, the trend method by ${units(trend.mae ?? 0)}.`;
	return { single, bestSingle, trend, method: useTrend ? 'trend' : 'single', scoredWeeks, forecast: chosen.next, trust: chosen.mae, why };
}
