/** What a tech enters for a balance run and for the assembly record (validated the same on every path). */
import { z } from 'zod';
import { PLANE_KEYS, RUN_KINDS } from './spec';

const amount = (label: string) =>
	z.coerce
		.number({ error: `${label}: enter the amount the machine shows.` })
		.refine((v) => Number.isFinite(v) && v >= 0 && v <= 1e6, `${label}: a number of 0 or more.`);
const angle = (label: string) =>
	z.coerce
		.number({ error: `${label}: enter the angle in degrees.` })
		.refine((v) => Number.isFinite(v) && v >= 0 && v < 360, `${label}: an angle from 0 to 359.9°.`);
const serialText = (label: string) =>
	z
		.string({ error: `Enter the ${label} serial.` })
		.trim()
		.min(1, `Enter the ${label} serial.`)
		.max(40, `The ${label} serial is too long.`);
const blankToNull = (v: unknown) => (v === '' || v === undefined ? null : v);

export const balanceRunInput = z
	.object({
		kind: z.enum(RUN_KINDS, { error: 'Choose initial, trial or check run.' }),
		trialPlane: z.preprocess(blankToNull, z.enum(PLANE_KEYS).nullable()),
		trialAmount: z.preprocess(blankToNull, amount('Trial mass').nullable()),
		trialAngle: z.preprocess(blankToNull, angle('Trial angle').nullable()),
		compAmount: amount('Compressor plane amount'),
		compAngle: angle('Compressor plane angle'),
		turbAmount: amount('Turbine plane amount'),
		turbAngle: angle('Turbine plane angle'),
		speedRpm: z.preprocess(blankToNull, z.coerce.number().int('Speed: whole rpm.').min(1).max(100000).nullable()),
		compWheelSerial: serialText('compressor wheel'),
		shaftWheelSerial: serialText('shaft-and-turbine wheel'),
		note: z.preprocess(blankToNull, z.string().trim().max(500, 'Keep the note under 500 characters.').nullable())
	})
	.superRefine((r, ctx) => {
		if (r.kind === 'trial') {
			if (!r.trialPlane) ctx.addIssue({ code: 'custom', path: ['trialPlane'], message: 'A trial run needs the plane the trial mass is in.' });
			if (!r.trialAmount) ctx.addIssue({ code: 'custom', path: ['trialAmount'], message: 'A trial run needs the trial mass (more than 0).' });
			if (r.trialAngle === null) ctx.addIssue({ code: 'custom', path: ['trialAngle'], message: 'A trial run needs the trial angle.' });
		}
	});
export type BalanceRunInput = z.infer<typeof balanceRunInput>;

const play = (label: string) =>
	z.coerce
		.number({ error: `${label}: enter the measured value in mm.` })
		.refine((v) => Number.isFinite(v) && v >= 0 && v <= 5, `${label}: a value from 0 to 5 mm.`);
const lot = (label: string) =>
	z
		.string({ error: `Enter the ${label} lot number.` })
		.trim()
		.min(1, `Enter the ${label} lot number.`)
		.max(40, `The ${label} lot number is too long.`);

export const assemblyInput = z.object({
	endPlayMm: play('End play'),
	radialPlayMm: play('Radial play'),
	bearingKitLot: lot('bearing kit'),
	sealKitLot: lot('seal kit'),
	compWheelSerial: serialText('compressor wheel'),
	shaftWheelSerial: serialText('shaft-and-turbine wheel'),
	wastegatePresetKpa: z.preprocess(
		blankToNull,
		z.coerce
			.number({ error: 'Wastegate preset: enter kPa gauge.' })
			.refine((v) => Number.isFinite(v) && v >= 0 && v <= 1000, 'Wastegate preset: 0 to 1000 kPa.')
			.nullable()
	),
	deviationReason: z.preprocess(
		blankToNull,
		z.string().trim().min(5, 'Say why the deviation is acceptable (at least 5 characters).').max(500, 'Keep the reason under 500 characters.').nullable()
	),
	note: z.preprocess(blankToNull, z.string().trim().max(500, 'Keep the note under 500 characters.').nullable())
});
export type AssemblyInput = z.infer<typeof assemblyInput>;
