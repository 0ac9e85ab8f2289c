/**
 * Turbocharger arithmetic used at the balance and assembly benches: compressor trim, wheel
 * tip speed and the shaft speed at the wheel's tip-speed limit, pressure ratio from gauge
 * boost and the ambient pressure, and psi ↔ kPa.
 */
import { pressureAtAltitude, SEA_LEVEL_PRESSURE_PA } from './atmosphere';

/** 1 psi = 6.894 757 kPa (NIST SP 811, appendix B.8: 6.894 757 E+03 Pa). */
export const KPA_PER_PSI = 6.894757293168361;

export const psiToKpa = (psi: number): number => psi * KPA_PER_PSI;
export const kpaToPsi = (kpa: number): number => kpa / KPA_PER_PSI;

/** Trim of a compressor wheel: (inducer / exducer)² · 100 (common practice). */
export function trim(inducer: number, exducer: number): number {
	if (!(inducer > 0) || !(exducer > 0)) throw new RangeError('diameters must be positive');
	return (inducer / exducer) ** 2 * 100;
}

/** Tip speed in m/s of a wheel of diameter `diameterMm` at `rpm`: π·D·n/60. */
export function tipSpeed(diameterMm: number, rpm: number): number {
	return (Math.PI * (diameterMm / 1000) * rpm) / 60;
}

/** The shaft speed (rpm) at which a wheel of diameter `diameterMm` reaches `limitMs`. */
export function speedAtTipLimit(diameterMm: number, limitMs: number): number {
	if (!(diameterMm > 0) || !(limitMs > 0)) throw new RangeError('diameter and limit must be positive');
	return (limitMs * 60) / (Math.PI * (diameterMm / 1000));
}

/** Pressure ratio from gauge boost (kPa) and ambient pressure (kPa): (boost + ambient) / ambient. */
export function pressureRatio(boostGaugeKpa: number, ambientKpa: number): number {
	if (!(ambientKpa > 0)) throw new RangeError('ambient pressure must be positive');
	return (boostGaugeKpa + ambientKpa) / ambientKpa;
}

/** Pressure ratio at an altitude (m, geometric) with the US Standard Atmosphere 1976 ambient. */
export function pressureRatioAtAltitude(boostGaugeKpa: number, altitudeM = 0): number {
	return pressureRatio(boostGaugeKpa, pressureAtAltitude(altitudeM) / 1000);
}

export { SEA_LEVEL_PRESSURE_PA };
