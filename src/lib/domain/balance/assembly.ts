/** The assembly check: measured plays and the wastegate preset against the model's limits. */
import { finite, nonNegative } from '../numbers';
import { kpaToPsi } from '../turbo/compressor';

export interface AssemblyLimits {
	endPlayMinMm: number;
	endPlayMaxMm: number;
	radialPlayMinMm: number;
	radialPlayMaxMm: number;
	wastegateMinKpa: number | null;
	wastegateMaxKpa: number | null;
}

export interface AssemblyMeasure {
	endPlayMm: number;
	radialPlayMm: number;
	wastegatePresetKpa: number | null;
}

const mm = (v: number) => `${v.toFixed(3)} mm`;
const kpa = (v: number) => `${v.toFixed(1)} kPa (${kpaToPsi(v).toFixed(1)} psi)`;

/** Out-of-limit findings as sentences; an empty list means within limits. */
export function assemblyFindings(limits: AssemblyLimits, m: AssemblyMeasure): string[] {
	if (typeof limits !== 'object' || limits === null || typeof m !== 'object' || m === null) throw new RangeError('The assembly check needs the limits and the measurements.');
	nonNegative('The end play minimum', limits.endPlayMinMm);
	nonNegative('The end play maximum', limits.endPlayMaxMm);
	nonNegative('The radial play minimum', limits.radialPlayMinMm);
	nonNegative('The radial play maximum', limits.radialPlayMaxMm);
	if (limits.wastegateMinKpa !== null) finite('The wastegate minimum', limits.wastegateMinKpa);
	if (limits.wastegateMaxKpa !== null) finite('The wastegate maximum', limits.wastegateMaxKpa);
	nonNegative('The measured end play', m.endPlayMm);
	nonNegative('The measured radial play', m.radialPlayMm);
	if (m.wastegatePresetKpa !== null) finite('The wastegate preset', m.wastegatePresetKpa);
	const out: string[] = [];
	const range = (what: string, v: number, lo: number, hi: number, fmt: (x: number) => string, extra = '') => {
		if (v < lo) out.push(`${what} ${fmt(v)} is below the minimum ${fmt(lo)}.${extra}`);
		else if (v > hi) out.push(`${what} ${fmt(v)} is above the maximum ${fmt(hi)}.${extra}`);
	};
	range('End play', m.endPlayMm, limits.endPlayMinMm, limits.endPlayMaxMm, mm);
	range('Radial play', m.radialPlayMm, limits.radialPlayMinMm, limits.radialPlayMaxMm, mm);
	if (limits.wastegateMinKpa !== null && limits.wastegateMaxKpa !== null) {
		if (m.wastegatePresetKpa === null) out.push('Wastegate preset is missing; this model has a wastegate window.');
		else
			range('Wastegate preset', m.wastegatePresetKpa, limits.wastegateMinKpa, limits.wastegateMaxKpa, kpa,
				m.wastegatePresetKpa > limits.wastegateMaxKpa ? ' Boost above the window can overspeed the wheel.' : '');
	}
	return out;
}
