/**
 * Demo data for balancing and assembly: an invented spec per demo model (demo data, not any
 * maker's numbers), and the assembly records and balance runs that the demo walk needs so every
 * seeded `assemble` and `balance` move has its passing record, as the guards require.
 */
import type { Role } from '../domain/auth/roles';
import type { ActionName } from '../domain/units/actions';
import { DEFAULT_SOURCES, type SpecNumbers } from '../domain/balance/spec';
import { allowance, evaluate, type RunLike } from '../domain/balance/workbench';
import { fromGmm } from '../domain/balance/tolerance';
import type { UnitFacts } from '../domain/units/guards';
import type { DbOrTx } from './db';
import { assemblyRecord, balanceRun, modelSpec } from './db/schema';

type Base = Omit<SpecNumbers, 'wastegateMinKpa' | 'wastegateMaxKpa'> & { wastegate: [number, number] | null };

const common = {
	gradeG: 6.3,
	tighteningFactor: 0.5,
	allocation: 'lever' as const,
	unbalanceUnit: 'mg' as const,
	correctionMode: 'remove' as const,
	endPlayMinMm: 0.025,
	endPlayMaxMm: 0.09,
	radialPlayMinMm: 0.3,
	radialPlayMaxMm: 0.6
};

/** Invented demo specs: plausible-looking numbers for the demo shop only. */
export const DEMO_SPECS: Record<string, Base> = {
	'CH-F46': { ...common, rotorMassKg: 0.35, maxServiceRpm: 180000, bearingCompMm: 30, bearingTurbMm: 68, centreOfMassMm: 52, planeCompMm: 8, planeTurbMm: 95, radiusCompMm: 18, radiusTurbMm: 20, positionsComp: 12, positionsTurb: 0, inducerMm: 36.5, exducerMm: 49, tipSpeedLimitMs: 520, wastegate: [90, 110] },
	'CH-F52': { ...common, rotorMassKg: 0.48, maxServiceRpm: 160000, bearingCompMm: 32, bearingTurbMm: 74, centreOfMassMm: 56, planeCompMm: 9, planeTurbMm: 104, radiusCompMm: 20, radiusTurbMm: 22, positionsComp: 12, positionsTurb: 0, inducerMm: 39.5, exducerMm: 53, tipSpeedLimitMs: 510, wastegate: [100, 125] },
	'CH-F58': { ...common, rotorMassKg: 0.62, maxServiceRpm: 140000, bearingCompMm: 35, bearingTurbMm: 80, centreOfMassMm: 60, planeCompMm: 10, planeTurbMm: 112, radiusCompMm: 22, radiusTurbMm: 25, positionsComp: 14, positionsTurb: 0, inducerMm: 43, exducerMm: 58.5, tipSpeedLimitMs: 500, wastegate: [110, 135] },
	'CH-V49': { ...common, rotorMassKg: 0.4, maxServiceRpm: 185000, bearingCompMm: 30, bearingTurbMm: 70, centreOfMassMm: 53, planeCompMm: 8, planeTurbMm: 97, radiusCompMm: 18, radiusTurbMm: 19, positionsComp: 12, positionsTurb: 0, inducerMm: 37, exducerMm: 49.5, tipSpeedLimitMs: 520, wastegate: null },
	'CH-V55': { ...common, rotorMassKg: 0.55, maxServiceRpm: 150000, bearingCompMm: 34, bearingTurbMm: 78, centreOfMassMm: 58, planeCompMm: 9, planeTurbMm: 108, radiusCompMm: 21, radiusTurbMm: 23, positionsComp: 12, positionsTurb: 0, inducerMm: 41, exducerMm: 55.5, tipSpeedLimitMs: 505, wastegate: null },
	'CH-P61': { ...common, tighteningFactor: 0.4, rotorMassKg: 0.7, maxServiceRpm: 135000, bearingCompMm: 36, bearingTurbMm: 82, centreOfMassMm: 61, planeCompMm: 10, planeTurbMm: 116, radiusCompMm: 24, radiusTurbMm: 26, positionsComp: 14, positionsTurb: 0, inducerMm: 46, exducerMm: 61, tipSpeedLimitMs: 530, wastegate: [140, 170] },
	'CH-P66': { ...common, tighteningFactor: 0.4, rotorMassKg: 0.82, maxServiceRpm: 125000, bearingCompMm: 38, bearingTurbMm: 86, centreOfMassMm: 64, planeCompMm: 11, planeTurbMm: 121, radiusCompMm: 26, radiusTurbMm: 28, positionsComp: 14, positionsTurb: 0, inducerMm: 50, exducerMm: 66, tipSpeedLimitMs: 530, wastegate: [150, 180] },
	'CH-K60': { ...common, rotorMassKg: 0.66, maxServiceRpm: 138000, bearingCompMm: 35, bearingTurbMm: 81, centreOfMassMm: 60, planeCompMm: 10, planeTurbMm: 114, radiusCompMm: 23, radiusTurbMm: 25, positionsComp: 12, positionsTurb: 0, inducerMm: 44.5, exducerMm: 60, tipSpeedLimitMs: 515, wastegate: [120, 150] }
};

export function demoSpecNumbers(code: string): SpecNumbers {
	const b = DEMO_SPECS[code] ?? DEMO_SPECS['CH-F46'];
	const { wastegate, ...rest } = b;
	return { ...rest, wastegateMinKpa: wastegate?.[0] ?? null, wastegateMaxKpa: wastegate?.[1] ?? null };
}

/** Insert the demo spec for one model (also used by tests that need a spec). */
export function insertDemoSpec(tx: DbOrTx, modelId: number, code: string, now = new Date()): void {
	tx.insert(modelSpec)
		.values({ modelId, ...demoSpecNumbers(code), sources: { ...DEFAULT_SOURCES }, demo: true, updatedAt: now })
		.run();
}

/** A small deterministic random source of its own, so the rest of the demo stays as it was. */
function mulberry(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

interface MoveContext {
	modelId: number;
	/** The unit's version before the move. */
	seq: number;
	at: Date;
	actor: { id: string; role: Role };
	stationId: number | null;
}

/**
 * Seed the specs of the demo models and return a recorder for the walk: `before(action, ctx)`
 * makes the record a move needs and returns the facts for the guard; `flush(unitId)` writes them.
 */
export function demoBuildRecords(tx: DbOrTx, models: { id: number; code: string }[], now: Date) {
	const random = mulberry(20261204);
	const specs = new Map<number, SpecNumbers>();
	for (const m of models) {
		insertDemoSpec(tx, m.id, m.code, now);
		specs.set(m.id, demoSpecNumbers(m.code));
	}
	let pendingAssembly: (typeof assemblyRecord.$inferInsert)[] = [];
	let pendingRuns: (typeof balanceRun.$inferInsert)[] = [];
	let runNo = 0;
	// a kit lot serves many builds: a handful of lots per kind, as a parts shelf holds
	const lot = (p: string) => `${p}-${String(2610 + Math.floor(random() * 6))}`;
	let wheels = { comp: '', shaft: '' };

	function before(action: ActionName, ctx: MoveContext): UnitFacts {
		const spec = specs.get(ctx.modelId)!;
		if (action === 'assemble') {
			const pick = (lo: number, hi: number) => lo + (hi - lo) * (0.2 + 0.6 * random());
			wheels = { comp: `CW-${100000 + Math.floor(random() * 899999)}`, shaft: `SW-${100000 + Math.floor(random() * 899999)}` };
			pendingAssembly.push({
				unitId: 0,
				afterSeq: ctx.seq,
				endPlayMm: Number(pick(spec.endPlayMinMm, spec.endPlayMaxMm).toFixed(3)),
				radialPlayMm: Number(pick(spec.radialPlayMinMm, spec.radialPlayMaxMm).toFixed(3)),
				bearingKitLot: lot('BK'),
				sealKitLot: lot('SK'),
				compWheelSerial: wheels.comp,
				shaftWheelSerial: wheels.shaft,
				wastegatePresetKpa: spec.wastegateMinKpa !== null && spec.wastegateMaxKpa !== null ? Math.round(pick(spec.wastegateMinKpa, spec.wastegateMaxKpa)) : null,
				withinLimits: true,
				findings: [],
				userId: ctx.actor.id,
				stationId: null,
				at: new Date(ctx.at.getTime() + 60_000)
			});
			return { hasAssemblyRecord: true };
		}
		if (action === 'balance') {
			// An initial run well outside the allowance, then a check run inside it after the correction.
			const earlier: RunLike[] = [];
			const { allocation } = allowance(spec);
			const tolMg = fromGmm(Math.min(...allocation.planes.map((p) => p.tolGmm)), 'mg', spec.radiusCompMm);
			const readings = [
				{ kind: 'initial' as const, f: 2 + 4 * random() },
				{ kind: 'check' as const, f: 0.05 + 0.15 * random() }
			];
			// the check run's residual creeps up over the last twelve days: the demo's worn arbor for the drift chart
			const wear = 0.3 * Math.max(0, 1 - (now.getTime() - ctx.at.getTime()) / (12 * 86_400_000));
			readings.forEach((r, i) => {
				const a1 = Math.floor(random() * 360);
				const k = 0.5 + random();
				const a2 = Math.floor(random() * 360);
				const readingAt = (f: number) => ({
					comp: { amount: Number((tolMg * f).toFixed(2)), angle: a1 },
					turb: { amount: Number((tolMg * f * k).toFixed(2)), angle: a2 }
				});
				let reading = readingAt(r.kind === 'check' ? r.f + wear : r.f);
				let ev = evaluate(spec, earlier, reading);
				if (r.kind === 'check' && !ev.verdict.pass) {
					// worn, but not past the allowance: a demo unit is only balanced once it passes
					reading = readingAt(r.f);
					ev = evaluate(spec, earlier, reading);
				}
				if (r.kind === 'check' && !ev.verdict.pass) throw new Error('demo check run does not pass');
				runNo += 1;
				pendingRuns.push({
					unitId: 0,
					runNo,
					afterSeq: ctx.seq,
					kind: r.kind,
					unbalanceUnit: spec.unbalanceUnit,
					compAmount: reading.comp.amount,
					compAngle: reading.comp.angle,
					turbAmount: reading.turb.amount,
					turbAngle: reading.turb.angle,
					speedRpm: 2400,
					method: ev.method,
					residualCompGmm: ev.verdict.planes[0].residualGmm,
					residualTurbGmm: ev.verdict.planes[1].residualGmm,
					tolCompGmm: ev.allocation.planes[0].tolGmm,
					tolTurbGmm: ev.allocation.planes[1].tolGmm,
					passed: ev.verdict.pass,
					correction: ev.verdict.pass ? null : { corrections: ev.corrections },
					compWheelSerial: wheels.comp || 'CW-000000',
					shaftWheelSerial: wheels.shaft || 'SW-000000',
					userId: ctx.actor.id,
					stationId: ctx.stationId,
					at: new Date(ctx.at.getTime() + (i + 1) * 60_000)
				});
				earlier.push({ kind: r.kind, trialPlane: null, trialAmount: null, trialAngle: null, reading });
			});
			return { hasPassingBalance: true };
		}
		return {};
	}

	function flush(unitId: number): void {
		for (const r of pendingAssembly) tx.insert(assemblyRecord).values({ ...r, unitId }).run();
		for (const r of pendingRuns) tx.insert(balanceRun).values({ ...r, unitId }).run();
		pendingAssembly = [];
		pendingRuns = [];
		runNo = 0;
		wheels = { comp: '', shaft: '' };
	}

	return { before, flush };
}
