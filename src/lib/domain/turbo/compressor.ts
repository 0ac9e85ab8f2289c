/**
 * Turbocharger arithmetic used at the balance and assembly benches: compressor trim, wheel
 * tip speed and the shaft speed at the wheel's tip-speed limit, pressure ratio from gauge
 * boost and the ambient pressure, and psi ↔ kPa.
 */
import { absolutePressure, finite, nonNegative, positive, result } from '../numbers';
import { pressureAtAltitude, SEA_LEVEL_PRESSURE_PA } from './atmosphere';

/** 1 psi = 6.894 757 kPa (NIST SP 811, appendix B.8: 6.894 757 E+03 Pa). */
export const KPA_PER_PSI = 6.894757293168361;

export const psiToKpa = (psi: number): number => result('The pressure in kPa', finite('The pressure in psi', psi) * KPA_PER_PSI);
export const kpaToPsi = (kpa: number): number => finite('The pressure in kPa', kpa) / KPA_PER_PSI;

/** Trim of a compressor wheel: (inducer / exducer)² · 100 (common practice). */
export function trim(inducer: number, exducer: number): number {
	positive('The inducer diameter', inducer);
	positive('The exducer diameter', exducer);
	return result('The trim', (inducer / exducer) ** 2 * 100);
}

/** Tip speed in m/s of a wheel of diameter `diameterMm` at `rpm`: π·D·n/60. */
export function tipSpeed(diameterMm: number, rpm: number): number {
	positive('The wheel diameter', diameterMm);
	nonNegative('The shaft speed', rpm);
	return result('The tip speed', (Math.PI * (diameterMm / 1000) * rpm) / 60);
}

/** The shaft speed (rpm) at which a wheel of diameter `diameterMm` reaches `limitMs`. */
export function speedAtTipLimit(diameterMm: number, limitMs: number): number {
	positive('The wheel diameter', diameterMm);
	positive('The tip-speed limit', limitMs);
	return result('The shaft speed at the tip-speed limit', (limitMs * 60) / (Math.PI * (diameterMm / 1000)));
}

/** Pressure ratio from gauge boost (kPa) and ambient pressure (kPa): (boost + ambient) / ambient. */
export function pressureRatio(boostGaugeKpa: number, ambientKpa: number): number {
	absolutePressure('An ambient pressure', ambientKpa);
	finite('The boost', boostGaugeKpa);
	const absoluteKpa = boostGaugeKpa + ambientKpa;
	if (!(absoluteKpa > 0)) {
		throw new RangeError(`A boost of ${boostGaugeKpa} kPa gauge at an ambient pressure of ${ambientKpa} kPa is at or below a full vacuum.`);
	}
	return result('The pressure ratio', absoluteKpa / ambientKpa);
}

/** Pressure ratio at an altitude (m, geometric) with the US Standard Atmosphere 1976 ambient. */
export function pressureRatioAtAltitude(boostGaugeKpa: number, altitudeM = 0): number {
	return pressureRatio(boostGaugeKpa, pressureAtAltitude(altitudeM) / 1000);
}

export { SEA_LEVEL_PRESSURE_PA };
