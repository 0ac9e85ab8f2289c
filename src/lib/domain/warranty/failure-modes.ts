/**
 * What a teardown finds as the cause of a returned turbocharger's failure: the trade's usual
 * categories (common practice). Recorded on the teardown verdict of a warranty return as
 * `data.failureMode`.
 */
export const FAILURE_MODES = [
	'overspeed',
	'oil_starvation',
	'oil_contamination',
	'foreign_object_damage',
	'seal_leakage',
	'bearing_failure',
	'other'
] as const;
export type FailureMode = (typeof FAILURE_MODES)[number];

export const FAILURE_MODE_LABEL: Record<FailureMode, string> = {
	overspeed: 'Overspeed',
	oil_starvation: 'Oil starvation',
	oil_contamination: 'Oil contamination',
	foreign_object_damage: 'Foreign object damage',
	seal_leakage: 'Seal leakage',
	bearing_failure: 'Bearing failure',
	other: 'Other'
};

export function isFailureMode(value: unknown): value is FailureMode {
	return typeof value === 'string' && (FAILURE_MODES as readonly string[]).includes(value);
}
