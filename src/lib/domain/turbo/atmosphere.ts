/**
 * Ambient pressure by altitude from the U.S. Standard Atmosphere, 1976 (NOAA/NASA/USAF),
 * for the troposphere and lower stratosphere (0 to 20 km geopotential).
 */
import { finite, result } from '../numbers';

export const SEA_LEVEL_PRESSURE_PA = 101325;
const T0 = 288.15; // K
const LAPSE = -0.0065; // K/m, 0–11 km geopotential
const G0 = 9.80665; // m/s²
const M0 = 0.0289644; // kg/mol
const R_STAR = 8.31432; // N·m/(mol·K), the value the 1976 standard uses
/** Effective Earth radius for geopotential altitude, m. */
const R0 = 6356766;

/** Geopotential altitude (m') from geometric altitude (m): H = r0·Z/(r0 + Z). */
export function geopotential(z: number): number {
	finite('The altitude', z);
	if (!(z > -R0)) throw new RangeError(`An altitude of ${z} m is below the centre of the Earth.`);
	return result('The geopotential altitude', (R0 * z) / (R0 + z));
}

/** Static pressure in Pa at geometric altitude `z` metres (−500 m to 20 km). */
export function pressureAtAltitude(z: number): number {
	finite('The altitude', z);
	if (z < -500 || z > 20000) throw new RangeError(`The altitude must be between −500 m and 20 000 m (got ${z} m).`);
	const h = geopotential(z);
	const k = (G0 * M0) / R_STAR;
	if (h <= 11000) return SEA_LEVEL_PRESSURE_PA * ((T0 + LAPSE * h) / T0) ** (-k / LAPSE);
	const t11 = T0 + LAPSE * 11000;
	const p11 = SEA_LEVEL_PRESSURE_PA * (t11 / T0) ** (-k / LAPSE);
	return p11 * Math.exp((-k * (h - 11000)) / t11);
}
