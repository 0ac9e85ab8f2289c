/** Build records that pass the demo spec of CH-F46 (see src/lib/server/seed-balance.ts). */
export const GOOD_ASSEMBLY = {
	endPlayMm: 0.05,
	radialPlayMm: 0.42,
	bearingKitLot: 'BK-2711',
	sealKitLot: 'SK-2712',
	compWheelSerial: 'CW-400101',
	shaftWheelSerial: 'SW-400102',
	wastegatePresetKpa: 100
};

export const GOOD_RUN = {
	kind: 'check',
	compAmount: 0.3,
	compAngle: 40,
	turbAmount: 0.2,
	turbAngle: 200,
	compWheelSerial: 'CW-400101',
	shaftWheelSerial: 'SW-400102'
};

export const FAILING_RUN = { ...GOOD_RUN, kind: 'initial', compAmount: 20, compAngle: 40, turbAmount: 15, turbAngle: 200 };
