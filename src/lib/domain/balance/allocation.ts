/**
 * Allocating the permissible residual unbalance U_per to two planes (ISO 21940-11:2016):
 *
 * - symmetric rotor: half in each plane;
 * - correction planes between the bearings (inboard rotor): the lever rule
 *   U_A = U·L_B/L and U_B = U·L_A/L (L_A, L_B: centre of mass to plane A, B; L = L_A + L_B),
 *   each share kept between 0.3·U and 0.7·U;
 * - correction planes outside the bearings (outboard or overhung rotor, e.g. a turbocharger
 *   with a wheel beyond each bearing): the standard takes the bearing planes as the reference
 *   planes for the tolerance. The lever rule and the 0.3/0.7 limits are applied to the
 *   bearing planes, and the residual unbalance in the correction planes is carried to the
 *   bearing planes by force and moment balance (statics) before it is compared.
 *
 * Axial positions are in mm along the shaft from any fixed datum (e.g. the compressor nose).
 */
import { finite, oneOf, positive, result } from '../numbers';
import { add, scale, checkComplex, type Complex, abs } from './complex';

export type AllocationMethod = 'symmetric' | 'lever';

export interface RotorGeometry {
	/** Compressor-side bearing, turbine-side bearing, centre of mass, plane A (compressor), plane B (turbine). */
	bearingCompMm: number;
	bearingTurbMm: number;
	centreOfMassMm: number;
	planeCompMm: number;
	planeTurbMm: number;
}

export type PlaneKey = 'comp' | 'turb';

export interface PlaneTolerance {
	key: PlaneKey;
	/** What the plane is, in words. */
	label: string;
	/** Permissible residual unbalance allocated to the plane, g·mm. */
	tolGmm: number;
	/** Share of U_per, 0..1. */
	share: number;
	/** True when the 0.3/0.7 limit set the share. */
	limited: boolean;
}

export interface Allocation {
	reference: 'correction_planes' | 'bearing_planes';
	method: AllocationMethod;
	total: number;
	planes: [PlaneTolerance, PlaneTolerance];
}

export const MIN_SHARE = 0.3;
export const MAX_SHARE = 0.7;

/** Lever rule with the 0.3/0.7 limits; `a`, `b` are the positions of the two planes, `cm` the centre of mass. */
export function leverShares(a: number, b: number, cm: number): { shareA: number; shareB: number; limited: boolean } {
	finite('The position of plane A', a);
	finite('The position of plane B', b);
	finite('The position of the centre of mass', cm);
	if (a === b) throw new RangeError('The two planes are at the same position.');
	const raw = leverRatio(b, cm, b, a); // L_B / L
	const shareA = Math.min(MAX_SHARE, Math.max(MIN_SHARE, raw));
	return { shareA, shareB: 1 - shareA, limited: shareA !== raw };
}

/**
 * (p − q) / (r − s) for positions along the shaft. Halving is exact, so the halved form gives
 * the same ratio when a difference would overflow (positions near the double range).
 */
function leverRatio(p: number, q: number, r: number, s: number): number {
	const num = p - q;
	const den = r - s;
	if (Number.isFinite(num) && Number.isFinite(den)) return result('The ratio of the distances along the shaft', num / den);
	return result('The ratio of the distances along the shaft', (p / 2 - q / 2) / (r / 2 - s / 2));
}

/** The rotor's positions, checked: finite numbers, the bearings apart. */
export function checkGeometry(g: RotorGeometry): RotorGeometry {
	if (typeof g !== 'object' || g === null) throw new RangeError('The rotor geometry is missing.');
	finite('The compressor-side bearing position', g.bearingCompMm);
	finite('The turbine-side bearing position', g.bearingTurbMm);
	finite('The centre of mass position', g.centreOfMassMm);
	finite('The compressor plane position', g.planeCompMm);
	finite('The turbine plane position', g.planeTurbMm);
	return g;
}

export function correctionPlanesInboard(g: RotorGeometry): boolean {
	checkGeometry(g);
	const lo = Math.min(g.bearingCompMm, g.bearingTurbMm);
	const hi = Math.max(g.bearingCompMm, g.bearingTurbMm);
	const inside = (z: number) => z >= lo && z <= hi;
	return inside(g.planeCompMm) && inside(g.planeTurbMm);
}

export function allocate(totalGmm: number, method: AllocationMethod, g: RotorGeometry): Allocation {
	positive('The permissible unbalance U_per', totalGmm);
	oneOf('The allocation method', method, ['symmetric', 'lever'] as const);
	const inboard = correctionPlanesInboard(g);
	const reference = inboard ? 'correction_planes' : 'bearing_planes';
	const names = inboard
		? { comp: 'Plane A · compressor wheel', turb: 'Plane B · turbine wheel' }
		: { comp: 'Compressor-side bearing', turb: 'Turbine-side bearing' };
	let shareA = 0.5;
	let shareB = 0.5;
	let limited = false;
	if (method === 'lever') {
		const [a, b] = inboard ? [g.planeCompMm, g.planeTurbMm] : [g.bearingCompMm, g.bearingTurbMm];
		({ shareA, shareB, limited } = leverShares(a, b, g.centreOfMassMm));
	}
	return {
		reference,
		method,
		total: totalGmm,
		planes: [
			{ key: 'comp', label: names.comp, tolGmm: totalGmm * shareA, share: shareA, limited },
			{ key: 'turb', label: names.turb, tolGmm: totalGmm * shareB, share: shareB, limited }
		]
	};
}

/**
 * Carry unbalances in the correction planes (g·mm vectors) to the bearing planes, keeping the
 * resultant and its moment: U1 + U2 = UA + UB and z1·U1 + z2·U2 = zA·UA + zB·UB.
 */
export function toBearingPlanes(g: RotorGeometry, comp: Complex, turb: Complex): [Complex, Complex] {
	checkGeometry(g);
	checkComplex('The compressor-plane unbalance', comp);
	checkComplex('The turbine-plane unbalance', turb);
	const z1 = g.bearingCompMm;
	const z2 = g.bearingTurbMm;
	if (z1 === z2) throw new RangeError('The two bearings are at the same position.');
	// The lever ratios first (positions only), then the vectors: no product of a reading and a
	// position can overflow on the way to a result that fits.
	const u1 = add(scale(comp, leverRatio(z2, g.planeCompMm, z2, z1)), scale(turb, leverRatio(z2, g.planeTurbMm, z2, z1)));
	const u2 = add(scale(comp, leverRatio(g.planeCompMm, z1, z2, z1)), scale(turb, leverRatio(g.planeTurbMm, z1, z2, z1)));
	return [u1, u2];
}

export interface PlaneVerdict {
	key: PlaneKey;
	label: string;
	residualGmm: number;
	tolGmm: number;
	/** Residual / tolerance: 1 means the whole allowance is used. */
	used: number;
	pass: boolean;
}

/** Pass or fail per reference plane; `comp`, `turb` are the residual unbalances in the correction planes, g·mm. */
export function judge(allocation: Allocation, g: RotorGeometry, comp: Complex, turb: Complex): { pass: boolean; planes: PlaneVerdict[] } {
	if (typeof allocation !== 'object' || allocation === null || !Array.isArray(allocation.planes) || allocation.planes.length !== 2) {
		throw new RangeError('The allowance needs a tolerance for each of the two planes.');
	}
	oneOf('The reference planes', allocation.reference, ['correction_planes', 'bearing_planes'] as const);
	allocation.planes.forEach((p) => positive(`The tolerance of ${p?.label ?? 'a plane'}`, p?.tolGmm));
	checkGeometry(g);
	checkComplex('The compressor-plane unbalance', comp);
	checkComplex('The turbine-plane unbalance', turb);
	const [r1, r2] = allocation.reference === 'correction_planes' ? [comp, turb] : toBearingPlanes(g, comp, turb);
	const planes = allocation.planes.map((p, i) => {
		const residualGmm = abs(i === 0 ? r1 : r2);
		const used = result(`The share of the allowance used in ${p.label}`, residualGmm / p.tolGmm);
		return { key: p.key, label: p.label, residualGmm, tolGmm: p.tolGmm, used, pass: used <= 1 };
	});
	return { pass: planes.every((p) => p.pass), planes };
}
