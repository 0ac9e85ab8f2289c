/** What a tech enters for a balance run and for the assembly record (validated the same on every path). */
import { z } from 'zod';
import { PLANE_KEYS, RUN_KINDS } from './spec';
import { isBlank, optionalNumber, requiredNumber, strictObject } from '../input/fields';

// A blank reading is refused (a blank is not 0); "0" typed on purpose is a reading.
const amountRules = (label: string) => ({
	blank: `${label}: enter the amount the machine shows (0 if it shows 0).`,
	notNumber: `${label}: enter the amount the machine shows as a number.`,
	min: 0,
	max: 1e6,
	range: `${label}: a number of 0 or more.`
});
const amount = (label: string) => requiredNumber(label, amountRules(label));
const angleRules = (label: string) => ({
	blank: `${label}: enter the angle in degrees (0 if it shows 0).`,
	notNumber: `${label}: enter the angle in degrees as a number.`,
	min: 0,
	max: 360,
	belowMax: true,
	range: `${label}: an angle from 0 to 359.9°.`
});
const angle = (label: string) => requiredNumber(label, angleRules(label));
const serialText = (label: string) =>
	z
		.string({ error: `Enter the ${label} serial.` })
		.trim()
		.min(1, `Enter the ${label} serial.`)
		.max(40, `The ${label} serial is too long.`);
const blankToNull = (v: unknown) => (isBlank(v) ? null : v);

/** The fields of a balance run, exactly (a form picks these; the JSON route refuses any other). */
const balanceRunFields = {
	kind: z.enum(RUN_KINDS, { error: 'Choose initial, trial or check run.' }),
	trialPlane: z.preprocess(blankToNull, z.enum(PLANE_KEYS, { error: 'Choose the plane the trial mass is in.' }).nullable()),
	trialAmount: optionalNumber('Trial mass', amountRules('Trial mass')),
	trialAngle: optionalNumber('Trial angle', angleRules('Trial angle')),
	compAmount: amount('Compressor plane amount'),
	compAngle: angle('Compressor plane angle'),
	turbAmount: amount('Turbine plane amount'),
	turbAngle: angle('Turbine plane angle'),
	speedRpm: optionalNumber('Speed', { int: true, whole: 'Speed: whole rpm.', min: 1, max: 100000, range: 'Speed: 1 to 100000 rpm.' }),
	compWheelSerial: serialText('compressor wheel'),
	shaftWheelSerial: serialText('shaft-and-turbine wheel'),
	note: z.preprocess(blankToNull, z.string({ error: 'The note is text.' }).trim().max(500, 'Keep the note under 500 characters.').nullable())
};
export const BALANCE_RUN_KEYS = Object.keys(balanceRunFields) as (keyof typeof balanceRunFields)[];

export const balanceRunInput = strictObject(balanceRunFields, 'A balance run').superRefine((r, ctx) => {
		if (r.kind === 'trial') {
			if (!r.trialPlane) ctx.addIssue({ code: 'custom', path: ['trialPlane'], message: 'A trial run needs the plane the trial mass is in.' });
			if (!r.trialAmount) ctx.addIssue({ code: 'custom', path: ['trialAmount'], message: 'A trial run needs the trial mass (more than 0).' });
			if (r.trialAngle === null) ctx.addIssue({ code: 'custom', path: ['trialAngle'], message: 'A trial run needs the trial angle.' });
		}
	});
export type BalanceRunInput = z.infer<typeof balanceRunInput>;

const play = (label: string) =>
	requiredNumber(label, {
		blank: `${label}: enter the measured value in mm.`,
		notNumber: `${label}: enter the measured value in mm as a number.`,
		min: 0,
		max: 5,
		range: `${label}: a value from 0 to 5 mm.`
	});
const lot = (label: string) =>
	z
		.string({ error: `Enter the ${label} lot number.` })
		.trim()
		.min(1, `Enter the ${label} lot number.`)
		.max(40, `The ${label} lot number is too long.`);

const assemblyFields = {
	endPlayMm: play('End play'),
	radialPlayMm: play('Radial play'),
	bearingKitLot: lot('bearing kit'),
	sealKitLot: lot('seal kit'),
	compWheelSerial: serialText('compressor wheel'),
	shaftWheelSerial: serialText('shaft-and-turbine wheel'),
	wastegatePresetKpa: optionalNumber('Wastegate preset', { notNumber: 'Wastegate preset: enter kPa gauge.', min: 0, max: 1000, range: 'Wastegate preset: 0 to 1000 kPa.' }),
	deviationReason: z.preprocess(
		blankToNull,
		z.string().trim().min(5, 'Say why the deviation is acceptable (at least 5 characters).').max(500, 'Keep the reason under 500 characters.').nullable()
	),
	note: z.preprocess(blankToNull, z.string({ error: 'The note is text.' }).trim().max(500, 'Keep the note under 500 characters.').nullable())
};
export const ASSEMBLY_KEYS = Object.keys(assemblyFields) as (keyof typeof assemblyFields)[];

export const assemblyInput = strictObject(assemblyFields, 'An assembly record');
export type AssemblyInput = z.infer<typeof assemblyInput>;
