/**
 * The balance workbench: from a model's spec and the runs of the current build, the allowance
 * per plane, the unbalance a reading stands for, pass or fail, and the correction to make.
 *
 * Without trial runs the machine is taken as calibrated for the rotor: a reading is the
 * unbalance itself (amount in the spec's unit, angle of the heavy spot). With a trial run in a
 * plane, that plane's influence coefficient is used; with one in each plane, the full two-plane
 * influence matrix.
 */
import { finite, list, nonNegative, nonNegativeInt, oneOf, positive } from '../numbers';
import { allocate, judge, type Allocation, type PlaneKey, type PlaneVerdict } from './allocation';
import { c, neg, polar, scale, toPolar, type Complex, type Polar } from './complex';
import { asMode, influence, solveCorrection, splitToPositions, type CorrectionMode, type Matrix2, type SplitPart } from './correction';
import { geometryOf, type RunKind, type SpecNumbers } from './spec';
import { effectiveGrade, fromGmm, permissibleUnbalance, toGmm, type UnbalanceUnit } from './tolerance';

export interface Reading {
	comp: Polar;
	turb: Polar;
}

export interface RunLike {
	kind: RunKind;
	trialPlane: PlaneKey | null;
	trialAmount: number | null;
	trialAngle: number | null;
	reading: Reading;
}

export type Method = 'direct' | 'single-plane' | 'two-plane';

export interface PlaneCorrection {
	key: PlaneKey;
	/** In the spec's unit. */
	amount: number;
	angle: number;
	mode: CorrectionMode;
	/** The correction split between the two nearest allowed positions, when positions are fixed. */
	split: SplitPart[] | null;
}

export interface Evaluation {
	uPer: number;
	grade: number;
	allocation: Allocation;
	method: Method;
	/** Unbalance per correction plane, g·mm vectors. */
	unbalanceGmm: Record<PlaneKey, Polar>;
	verdict: { pass: boolean; planes: PlaneVerdict[] };
	corrections: PlaneCorrection[];
}

/** The spec's numbers, checked: each finite; masses, speeds, radii and diameters above 0; positions whole; plays 0 or more. */
export function checkSpec(spec: SpecNumbers): SpecNumbers {
	if (typeof spec !== 'object' || spec === null) throw new RangeError('The balance spec is missing.');
	positive('The rotor mass', spec.rotorMassKg);
	positive('The maximum service speed', spec.maxServiceRpm);
	positive('The balance grade G', spec.gradeG);
	positive('The tightening factor', spec.tighteningFactor);
	oneOf('The allocation method', spec.allocation, ['symmetric', 'lever'] as const);
	geometryOf(spec);
	positive('The compressor correction radius', spec.radiusCompMm);
	positive('The turbine correction radius', spec.radiusTurbMm);
	nonNegativeInt('The number of compressor positions', spec.positionsComp);
	nonNegativeInt('The number of turbine positions', spec.positionsTurb);
	oneOf('The unbalance unit', spec.unbalanceUnit, ['g', 'mg', 'g_mm', 'mg_mm', 'oz_in'] as const);
	oneOf('The correction mode', spec.correctionMode, ['add', 'remove'] as const);
	positive('The inducer diameter', spec.inducerMm);
	positive('The exducer diameter', spec.exducerMm);
	positive('The tip-speed limit', spec.tipSpeedLimitMs);
	if (spec.wastegateMinKpa !== null) finite('The wastegate minimum', spec.wastegateMinKpa);
	if (spec.wastegateMaxKpa !== null) finite('The wastegate maximum', spec.wastegateMaxKpa);
	for (const [k, label] of [
		['endPlayMinMm', 'The end play minimum'],
		['endPlayMaxMm', 'The end play maximum'],
		['radialPlayMinMm', 'The radial play minimum'],
		['radialPlayMaxMm', 'The radial play maximum']
	] as const) nonNegative(label, spec[k]);
	return spec;
}

/** A reading, checked: amounts of 0 or more and finite angles in each plane. */
export function checkReading(name: string, r: Reading): Reading {
	if (typeof r !== 'object' || r === null || typeof r.comp !== 'object' || r.comp === null || typeof r.turb !== 'object' || r.turb === null) {
		throw new RangeError(`${name} needs an amount and an angle in each plane.`);
	}
	nonNegative(`${name}: the compressor-plane amount`, r.comp.amount);
	finite(`${name}: the compressor-plane angle`, r.comp.angle);
	nonNegative(`${name}: the turbine-plane amount`, r.turb.amount);
	finite(`${name}: the turbine-plane angle`, r.turb.angle);
	return r;
}

export function allowance(spec: SpecNumbers): { uPer: number; grade: number; allocation: Allocation } {
	checkSpec(spec);
	const grade = effectiveGrade(spec.gradeG, spec.tighteningFactor);
	const uPer = permissibleUnbalance(grade, spec.rotorMassKg, spec.maxServiceRpm);
	return { uPer, grade, allocation: allocate(uPer, spec.allocation, geometryOf(spec)) };
}

const vec = (p: Polar): Complex => polar(p.amount, p.angle);

/** The influence matrix from the latest initial run and the trial runs after it, in spec units per spec unit. */
export function influenceFrom(runs: readonly RunLike[]): { h: Matrix2; method: Method } {
	const identity: Matrix2 = [
		[c(1), c(0)],
		[c(0), c(1)]
	];
	let initialAt = -1;
	list<RunLike>('The earlier runs', runs).forEach((r, i) => {
		if (typeof r !== 'object' || r === null) throw new RangeError(`Run ${i + 1} is missing.`);
		checkReading(`Run ${i + 1}`, r.reading);
		if (r.kind === 'trial' && r.trialAmount !== null && r.trialAmount !== undefined) {
			nonNegative(`Run ${i + 1}: the trial mass`, r.trialAmount);
			if (r.trialAngle !== null && r.trialAngle !== undefined) finite(`Run ${i + 1}: the trial angle`, r.trialAngle);
		}
		if (r.kind === 'initial') initialAt = i;
	});
	if (initialAt < 0) return { h: identity, method: 'direct' };
	const initial = runs[initialAt].reading;
	const trials: Partial<Record<PlaneKey, RunLike>> = {};
	for (const r of runs.slice(initialAt + 1)) {
		if (r.kind === 'trial' && r.trialPlane && r.trialAmount && r.trialAmount > 0) trials[r.trialPlane] = r;
	}
	const h: Matrix2 = [
		[c(1), c(0)],
		[c(0), c(1)]
	];
	const planes: PlaneKey[] = ['comp', 'turb'];
	let count = 0;
	planes.forEach((plane, j) => {
		const t = trials[plane];
		if (!t) return;
		count += 1;
		const tv = polar(t.trialAmount!, t.trialAngle ?? 0);
		h[0][j] = influence(vec(initial.comp), vec(t.reading.comp), tv);
		h[1][j] = influence(vec(initial.turb), vec(t.reading.turb), tv);
	});
	if (count === 0) return { h: identity, method: 'direct' };
	if (count === 1) {
		// One plane with a trial: use only its own coefficient, the other plane as read (single-plane method).
		const j = trials.comp ? 0 : 1;
		const k = 1 - j;
		h[k][j] = c(0);
		h[j][k] = c(0);
		h[k][k] = c(1);
		return { h, method: 'single-plane' };
	}
	return { h, method: 'two-plane' };
}

/** Evaluate a reading against the spec, with the influence coefficients from the runs before it. */
export function evaluate(spec: SpecNumbers, earlier: readonly RunLike[], reading: Reading): Evaluation {
	checkReading('The reading', reading);
	const { uPer, grade, allocation } = allowance(spec);
	const { h, method } = influenceFrom(earlier);
	const [wComp, wTurb] = solveCorrection(h, [vec(reading.comp), vec(reading.turb)]);
	// The unbalance is what the correction cancels: −W, in spec units, then in g·mm.
	const unit: UnbalanceUnit = spec.unbalanceUnit;
	const uComp = scale(neg(wComp), toGmm(1, unit, spec.radiusCompMm));
	const uTurb = scale(neg(wTurb), toGmm(1, unit, spec.radiusTurbMm));
	const verdict = judge(allocation, geometryOf(spec), uComp, uTurb);
	const corrections: PlaneCorrection[] = [];
	if (!verdict.pass) {
		for (const [key, w, positions] of [
			['comp', wComp, spec.positionsComp],
			['turb', wTurb, spec.positionsTurb]
		] as const) {
			const p = asMode(w, spec.correctionMode);
			if (p.amount <= 0) continue;
			corrections.push({
				key,
				amount: p.amount,
				angle: p.angle,
				mode: spec.correctionMode,
				split: positions >= 3 ? splitToPositions(p.amount, p.angle, positions) : null
			});
		}
	}
	return {
		uPer,
		grade,
		allocation,
		method,
		unbalanceGmm: { comp: toPolar(uComp), turb: toPolar(uTurb) },
		verdict,
		corrections
	};
}

/** A tolerance in g·mm shown in the spec's unit for a plane. */
export function inSpecUnit(gmm: number, spec: SpecNumbers, plane: PlaneKey): number {
	checkSpec(spec);
	oneOf('The plane', plane, ['comp', 'turb'] as const);
	return fromGmm(gmm, spec.unbalanceUnit, plane === 'comp' ? spec.radiusCompMm : spec.radiusTurbMm);
}


