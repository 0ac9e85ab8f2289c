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
import { add, scale, type Complex, abs } from './complex';

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
	const L = b - a;
	if (L === 0) throw new RangeError('the two planes are at the same position');
	const raw = (b - cm) / L; // L_B / L
	const shareA = Math.min(MAX_SHARE, Math.max(MIN_SHARE, raw));
	return { shareA, shareB: 1 - shareA, limited: shareA !== raw };
}

export function correctionPlanesInboard(g: RotorGeometry): boolean {
	const lo = Math.min(g.bearingCompMm, g.bearingTurbMm);
	const hi = Math.max(g.bearingCompMm, g.bearingTurbMm);
	const inside = (z: number) => z >= lo && z <= hi;
	return inside(g.planeCompMm) && inside(g.planeTurbMm);
}

export function allocate(totalGmm: number, method: AllocationMethod, g: RotorGeometry): Allocation {
	if (!(totalGmm > 0)) throw new RangeError('U_per must be positive');
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
	const z1 = g.bearingCompMm;
	const z2 = g.bearingTurbMm;
	const d = z2 - z1;
	if (d === 0) throw new RangeError('the bearings are at the same position');
	const u1 = scale(add(scale(comp, z2 - g.planeCompMm), scale(turb, z2 - g.planeTurbMm)), 1 / d);
	const u2 = scale(add(scale(comp, g.planeCompMm - z1), scale(turb, g.planeTurbMm - z1)), 1 / d);
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
	const [r1, r2] = allocation.reference === 'correction_planes' ? [comp, turb] : toBearingPlanes(g, comp, turb);
	const planes = allocation.planes.map((p, i) => {
		const residualGmm = abs(i === 0 ? r1 : r2);
		const used = residualGmm / p.tolGmm;
		return { key: p.key, label: p.label, residualGmm, tolGmm: p.tolGmm, used, pass: used <= 1 };
	});
	return { pass: planes.every((p) => p.pass), planes };
}
