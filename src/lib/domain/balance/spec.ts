/**
 * A turbo model's balancing and assembly spec: the numbers, their units, and where each comes
 * from (the maker's data, the shop's choice, or the standard).
 */
import { z } from 'zod';
import { UNBALANCE_UNITS, type UnbalanceUnit } from './tolerance';
import { checkGeometry, type AllocationMethod, type RotorGeometry } from './allocation';
import { optionalNumber, requiredNumber } from '../input/fields';

export const ALLOCATION_METHODS = ['symmetric', 'lever'] as const satisfies readonly AllocationMethod[];
export const CORRECTION_MODES = ['add', 'remove'] as const;
export const RUN_KINDS = ['initial', 'trial', 'check'] as const;
export const PLANE_KEYS = ['comp', 'turb'] as const;
export type RunKind = (typeof RUN_KINDS)[number];

export const SOURCE_KINDS = ['maker', 'shop', 'standard'] as const;
export type SourceKind = (typeof SOURCE_KINDS)[number];
export const SOURCE_LABEL: Record<SourceKind, string> = {
	maker: "Maker's data",
	shop: "Shop's choice",
	standard: 'Standard'
};

export interface SpecNumbers {
	rotorMassKg: number;
	maxServiceRpm: number;
	gradeG: number;
	tighteningFactor: number;
	allocation: AllocationMethod;
	bearingCompMm: number;
	bearingTurbMm: number;
	centreOfMassMm: number;
	planeCompMm: number;
	planeTurbMm: number;
	radiusCompMm: number;
	radiusTurbMm: number;
	positionsComp: number;
	positionsTurb: number;
	unbalanceUnit: UnbalanceUnit;
	correctionMode: (typeof CORRECTION_MODES)[number];
	inducerMm: number;
	exducerMm: number;
	tipSpeedLimitMs: number;
	wastegateMinKpa: number | null;
	wastegateMaxKpa: number | null;
	endPlayMinMm: number;
	endPlayMaxMm: number;
	radialPlayMinMm: number;
	radialPlayMaxMm: number;
}

/** The numbers whose origin is recorded. */
export const SOURCED_FIELDS = [
	'rotorMassKg',
	'maxServiceRpm',
	'gradeG',
	'tighteningFactor',
	'geometry',
	'radii',
	'positions',
	'wheel',
	'tipSpeedLimitMs',
	'wastegate',
	'endPlay',
	'radialPlay'
] as const;
export type SourcedField = (typeof SOURCED_FIELDS)[number];
export type SpecSources = Partial<Record<SourcedField, SourceKind>>;

export const SOURCED_LABEL: Record<SourcedField, string> = {
	rotorMassKg: 'Rotating-assembly mass',
	maxServiceRpm: 'Maximum service speed',
	gradeG: 'Balance quality grade G',
	tighteningFactor: 'Tightening factor',
	geometry: 'Bearing, plane and centre-of-mass positions',
	radii: 'Correction radii',
	positions: 'Allowed correction positions',
	wheel: 'Compressor inducer and exducer',
	tipSpeedLimitMs: "Wheel's tip-speed limit",
	wastegate: 'Wastegate preset window',
	endPlay: 'Shaft end-play limits',
	radialPlay: 'Shaft radial-play limits'
};

/** Where a number usually comes from when nobody said otherwise. */
export const DEFAULT_SOURCES: Required<SpecSources> = {
	rotorMassKg: 'maker',
	maxServiceRpm: 'maker',
	gradeG: 'standard',
	tighteningFactor: 'shop',
	geometry: 'maker',
	radii: 'maker',
	positions: 'maker',
	wheel: 'maker',
	tipSpeedLimitMs: 'maker',
	wastegate: 'maker',
	endPlay: 'maker',
	radialPlay: 'maker'
};

export function geometryOf(s: SpecNumbers): RotorGeometry {
	if (typeof s !== 'object' || s === null) throw new RangeError('The balance spec is missing.');
	return checkGeometry({
		bearingCompMm: s.bearingCompMm,
		bearingTurbMm: s.bearingTurbMm,
		centreOfMassMm: s.centreOfMassMm,
		planeCompMm: s.planeCompMm,
		planeTurbMm: s.planeTurbMm
	});
}

// a blank field is refused (it is not 0); "0" typed on purpose is a value
const num = (label: string, min: number, max: number) => requiredNumber(label, { min, max, range: `${label}: between ${min} and ${max}.` });

const optionalNum = (label: string, min: number, max: number) => optionalNumber(label, { min, max, range: `${label}: between ${min} and ${max}.` });

/** The owner's spec form; cross-field checks say which pair is wrong. */
export const specSchema = z
	.object({
		rotorMassKg: num('Mass', 0.01, 50),
		maxServiceRpm: num('Maximum service speed', 1000, 400000).transform(Math.round),
		gradeG: num('Grade G', 0.1, 100),
		tighteningFactor: num('Tightening factor', 0.05, 1),
		allocation: z.enum(ALLOCATION_METHODS, { error: 'Choose how the allowance is split.' }),
		bearingCompMm: num('Compressor-side bearing position', -1000, 1000),
		bearingTurbMm: num('Turbine-side bearing position', -1000, 1000),
		centreOfMassMm: num('Centre of mass position', -1000, 1000),
		planeCompMm: num('Compressor plane position', -1000, 1000),
		planeTurbMm: num('Turbine plane position', -1000, 1000),
		radiusCompMm: num('Compressor correction radius', 1, 500),
		radiusTurbMm: num('Turbine correction radius', 1, 500),
		positionsComp: num('Compressor positions', 0, 64).transform(Math.round),
		positionsTurb: num('Turbine positions', 0, 64).transform(Math.round),
		unbalanceUnit: z.enum(UNBALANCE_UNITS, { error: 'Choose the unit the machine shows.' }),
		correctionMode: z.enum(CORRECTION_MODES, { error: 'Choose add or remove.' }),
		inducerMm: num('Inducer', 1, 500),
		exducerMm: num('Exducer', 1, 500),
		tipSpeedLimitMs: num('Tip-speed limit', 50, 1000),
		wastegateMinKpa: optionalNum('Wastegate minimum', 0, 1000),
		wastegateMaxKpa: optionalNum('Wastegate maximum', 0, 1000),
		endPlayMinMm: num('End play minimum', 0, 5),
		endPlayMaxMm: num('End play maximum', 0, 5),
		radialPlayMinMm: num('Radial play minimum', 0, 5),
		radialPlayMaxMm: num('Radial play maximum', 0, 5)
	})
	.superRefine((s, ctx) => {
		const pair = (lo: keyof typeof s, hi: keyof typeof s, what: string) => {
			const a = s[lo] as number | null;
			const b = s[hi] as number | null;
			if (a !== null && b !== null && a > b) ctx.addIssue({ code: 'custom', path: [hi], message: `${what}: the maximum is below the minimum.` });
		};
		pair('endPlayMinMm', 'endPlayMaxMm', 'End play');
		pair('radialPlayMinMm', 'radialPlayMaxMm', 'Radial play');
		pair('wastegateMinKpa', 'wastegateMaxKpa', 'Wastegate window');
		if ((s.wastegateMinKpa === null) !== (s.wastegateMaxKpa === null)) {
			ctx.addIssue({ code: 'custom', path: ['wastegateMaxKpa'], message: 'Give both ends of the wastegate window, or neither.' });
		}
		if (s.bearingCompMm === s.bearingTurbMm) ctx.addIssue({ code: 'custom', path: ['bearingTurbMm'], message: 'The two bearings cannot be at the same position.' });
		if (s.planeCompMm === s.planeTurbMm) ctx.addIssue({ code: 'custom', path: ['planeTurbMm'], message: 'The two correction planes cannot be at the same position.' });
		if (s.inducerMm >= s.exducerMm) ctx.addIssue({ code: 'custom', path: ['inducerMm'], message: 'The inducer is smaller than the exducer on a compressor wheel.' });
		for (const k of ['positionsComp', 'positionsTurb'] as const) {
			if (s[k] === 1 || s[k] === 2) ctx.addIssue({ code: 'custom', path: [k], message: 'Use 0 (anywhere) or at least 3 positions.' });
		}
	});
