/**
 * Permissible residual unbalance of a rotor with rigid behaviour (ISO 21940-11:2016, the
 * balance quality grade G): U_per = 1000 · G · m / Ω, in g·mm with G in mm/s, m in kg and
 * Ω in rad/s; the specific unbalance e_per = U_per / m in g·mm/kg (= µm).
 */
import { finite, nonNegative, oneOf, positive, result } from '../numbers';

/** Angular speed in rad/s from a speed in rev/min. */
export function omegaFromRpm(rpm: number): number {
	nonNegative('The speed', rpm);
	return result('The angular speed', (2 * Math.PI * rpm) / 60);
}

/** Permissible residual unbalance U_per in g·mm. */
export function permissibleUnbalance(gradeMmS: number, massKg: number, rpm: number): number {
	positive('The balance grade G', gradeMmS);
	positive('The rotor mass', massKg);
	positive('The speed', rpm);
	return result('The permissible unbalance', (1000 * gradeMmS * massKg) / omegaFromRpm(rpm));
}

/** Specific permissible unbalance e_per in g·mm/kg (numerically µm of mass-centre offset). */
export function specificUnbalance(gradeMmS: number, rpm: number): number {
	positive('The balance grade G', gradeMmS);
	positive('The speed', rpm);
	return result('The specific unbalance', (1000 * gradeMmS) / omegaFromRpm(rpm));
}

/** The grade the shop balances to: the chosen grade times its tightening factor (0 < f ≤ 1). */
export function effectiveGrade(gradeMmS: number, tighteningFactor: number): number {
	positive('The balance grade G', gradeMmS);
	finite('The tightening factor', tighteningFactor);
	if (!(tighteningFactor > 0) || tighteningFactor > 1) throw new RangeError(`The tightening factor must be above 0 and at most 1 (got ${tighteningFactor}).`);
	return gradeMmS * tighteningFactor;
}

/** The grade ISO 21940-11:2016 (Table 1) lists for turbochargers, in mm/s. */
export const ISO_TURBOCHARGER_GRADE = 6.3;

// Units of unbalance. 1 oz (avoirdupois) = 28.349 523 125 g and 1 in = 25.4 mm, exactly (NIST SP 811).
export const GRAMS_PER_OUNCE = 28.349523125;
export const MM_PER_INCH = 25.4;
export const GMM_PER_OZIN = GRAMS_PER_OUNCE * MM_PER_INCH;

export const UNBALANCE_UNITS = ['g', 'mg', 'g_mm', 'mg_mm', 'oz_in'] as const;
export type UnbalanceUnit = (typeof UNBALANCE_UNITS)[number];

export const UNBALANCE_UNIT_LABEL: Record<UnbalanceUnit, string> = {
	g: 'g at the correction radius',
	mg: 'mg at the correction radius',
	g_mm: 'g·mm',
	mg_mm: 'mg·mm',
	oz_in: 'oz·in'
};

export const UNBALANCE_UNIT_SHORT: Record<UnbalanceUnit, string> = {
	g: 'g',
	mg: 'mg',
	g_mm: 'g·mm',
	mg_mm: 'mg·mm',
	oz_in: 'oz·in'
};

/** An amount in `unit` as g·mm; `radiusMm` is needed for masses at the correction radius. */
export function toGmm(amount: number, unit: UnbalanceUnit, radiusMm = 0): number {
	nonNegative('The unbalance', amount);
	oneOf('The unbalance unit', unit, UNBALANCE_UNITS);
	finite('The correction radius', radiusMm);
	return result('The unbalance in g·mm', gmmOf(amount, unit, radiusMm));
}

function gmmOf(amount: number, unit: UnbalanceUnit, radiusMm: number): number {
	switch (unit) {
		case 'g_mm':
			return amount;
		case 'mg_mm':
			return amount / 1000;
		case 'oz_in':
			return amount * GMM_PER_OZIN;
		case 'g':
		case 'mg': {
			if (!(radiusMm > 0)) throw new RangeError('A mass at the correction radius needs that radius (more than 0 mm).');
			return (unit === 'g' ? amount : amount / 1000) * radiusMm;
		}
	}
}

/** g·mm as an amount in `unit`. */
export function fromGmm(gmm: number, unit: UnbalanceUnit, radiusMm = 0): number {
	nonNegative('The unbalance', gmm);
	oneOf('The unbalance unit', unit, UNBALANCE_UNITS);
	finite('The correction radius', radiusMm);
	return result(`The unbalance in ${unit}`, amountOf(gmm, unit, radiusMm));
}

function amountOf(gmm: number, unit: UnbalanceUnit, radiusMm: number): number {
	switch (unit) {
		case 'g_mm':
			return gmm;
		case 'mg_mm':
			return gmm * 1000;
		case 'oz_in':
			return gmm / GMM_PER_OZIN;
		case 'g':
		case 'mg': {
			if (!(radiusMm > 0)) throw new RangeError('A mass at the correction radius needs that radius (more than 0 mm).');
			const g = gmm / radiusMm;
			return unit === 'g' ? g : g * 1000;
		}
	}
}
