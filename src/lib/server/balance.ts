/**
 * Model specs, balance runs and assembly records. Recording is one immediate transaction that
 * re-reads the unit, checks its state, computes the verdict on the server and inserts the row.
 */
import { and, asc, desc, eq, gte, max } from 'drizzle-orm';
import { STEERING_ROLES } from '../domain/auth/roles';
import { assemblyFindings } from '../domain/balance/assembly';
import type { PlaneKey } from '../domain/balance/allocation';
import { assemblyInput, balanceRunInput, type AssemblyInput, type BalanceRunInput } from '../domain/balance/records';
import { DEFAULT_SOURCES, SOURCED_FIELDS, specSchema, type SpecNumbers, type SpecSources } from '../domain/balance/spec';
import { evaluate, type Evaluation, type RunLike } from '../domain/balance/workbench';
import type { UnitState } from '../domain/units/states';
import { badNumberMessage } from './bad-numbers';
import { zodFields } from './http';
import type { Actor } from './units';
import type { Db, DbOrTx } from './db';
import { assemblyRecord, balanceRun, modelSpec, station, turboModel, unit, unitEvent, user, type AssemblyRecord, type BalanceRun, type ModelSpec, type Unit } from './db/schema';

export type RecordResult<T> =
	| { ok: true; record: T }
	| { ok: false; status: 400 | 403 | 404 | 409; message: string; fields?: Record<string, string[]> };

export function specNumbers(s: ModelSpec): SpecNumbers {
	return {
		rotorMassKg: s.rotorMassKg,
		maxServiceRpm: s.maxServiceRpm,
		gradeG: s.gradeG,
		tighteningFactor: s.tighteningFactor,
		allocation: s.allocation,
		bearingCompMm: s.bearingCompMm,
		bearingTurbMm: s.bearingTurbMm,
		centreOfMassMm: s.centreOfMassMm,
		planeCompMm: s.planeCompMm,
		planeTurbMm: s.planeTurbMm,
		radiusCompMm: s.radiusCompMm,
		radiusTurbMm: s.radiusTurbMm,
		positionsComp: s.positionsComp,
		positionsTurb: s.positionsTurb,
		unbalanceUnit: s.unbalanceUnit,
		correctionMode: s.correctionMode,
		inducerMm: s.inducerMm,
		exducerMm: s.exducerMm,
		tipSpeedLimitMs: s.tipSpeedLimitMs,
		wastegateMinKpa: s.wastegateMinKpa,
		wastegateMaxKpa: s.wastegateMaxKpa,
		endPlayMinMm: s.endPlayMinMm,
		endPlayMaxMm: s.endPlayMaxMm,
		radialPlayMinMm: s.radialPlayMinMm,
		radialPlayMaxMm: s.radialPlayMaxMm
	};
}

export interface ModelWithSpec {
	id: number;
	code: string;
	family: string;
	description: string;
	spec: ModelSpec | null;
}

export function listModelsWithSpecs(db: DbOrTx): ModelWithSpec[] {
	return db
		.select({ model: turboModel, spec: modelSpec })
		.from(turboModel)
		.leftJoin(modelSpec, eq(modelSpec.modelId, turboModel.id))
		.orderBy(asc(turboModel.code))
		.all()
		.map((r) => ({ id: r.model.id, code: r.model.code, family: r.model.family, description: r.model.description, spec: r.spec }));
}

export function getModelWithSpec(db: DbOrTx, code: string): ModelWithSpec | null {
	return listModelsWithSpecs(db).find((m) => m.code === code) ?? null;
}

export function specForModel(db: DbOrTx, modelId: number): ModelSpec | null {
	return db.select().from(modelSpec).where(eq(modelSpec.modelId, modelId)).get() ?? null;
}

/** Save a model's spec (owner). `raw` is the form's fields; `sources` says where each number comes from. */
export function saveSpec(
	db: Db,
	actor: Actor,
	code: string,
	raw: Record<string, unknown>,
	sources: Record<string, unknown>,
	now = new Date()
): RecordResult<ModelSpec> {
	if (actor.role !== 'owner') return { ok: false, status: 403, message: 'Only the owner edits model specs.' };
	const parsed = specSchema.safeParse(raw);
	if (!parsed.success) return { ok: false, status: 400, message: parsed.error.issues[0]?.message ?? 'Check the spec.', fields: zodFields(parsed.error) };
	const src: SpecSources = {};
	for (const f of SOURCED_FIELDS) {
		const v = sources[f];
		src[f] = v === 'maker' || v === 'shop' || v === 'standard' ? v : DEFAULT_SOURCES[f];
	}
	return db.transaction(
		(tx): RecordResult<ModelSpec> => {
			const model = tx.select().from(turboModel).where(eq(turboModel.code, code)).get();
			if (!model) return { ok: false, status: 404, message: `No model ${code}.` };
			const values = { ...parsed.data, sources: src, demo: false, updatedAt: now, updatedBy: actor.id };
			const row = tx
				.insert(modelSpec)
				.values({ modelId: model.id, ...values })
				.onConflictDoUpdate({ target: modelSpec.modelId, set: values })
				.returning()
				.get();
			return { ok: true, record: row };
		},
		{ behavior: 'immediate' }
	);
}

/** The seq of the latest event that put the unit into `state` (0 if none). */
export function lastSeqInto(tx: DbOrTx, unitId: number, state: UnitState): number {
	const r = tx
		.select({ seq: max(unitEvent.seq) })
		.from(unitEvent)
		.where(and(eq(unitEvent.unitId, unitId), eq(unitEvent.toState, state)))
		.get();
	return r?.seq ?? 0;
}

/** Balance runs of the current build: recorded since the unit last became assembled. */
export function currentBuildRuns(tx: DbOrTx, unitId: number): BalanceRun[] {
	const since = lastSeqInto(tx, unitId, 'assembled');
	return tx
		.select()
		.from(balanceRun)
		.where(and(eq(balanceRun.unitId, unitId), gte(balanceRun.afterSeq, since)))
		.orderBy(asc(balanceRun.runNo))
		.all();
}

/** Assembly records of the current build: recorded since the unit last became painted. */
export function currentAssemblyRecords(tx: DbOrTx, unitId: number): AssemblyRecord[] {
	const since = lastSeqInto(tx, unitId, 'painted');
	return tx
		.select()
		.from(assemblyRecord)
		.where(and(eq(assemblyRecord.unitId, unitId), gte(assemblyRecord.afterSeq, since)))
		.orderBy(asc(assemblyRecord.id))
		.all();
}

export function hasPassingBalance(tx: DbOrTx, unitId: number): boolean {
	return currentBuildRuns(tx, unitId).some((r) => r.passed && r.kind !== 'trial');
}

export function hasAcceptedAssembly(tx: DbOrTx, unitId: number): boolean {
	return currentAssemblyRecords(tx, unitId).some((r) => r.withinLimits || r.approvedBy !== null);
}

export function runLike(r: BalanceRun): RunLike {
	return {
		kind: r.kind,
		trialPlane: r.trialPlane,
		trialAmount: r.trialAmount,
		trialAngle: r.trialAngle,
		reading: { comp: { amount: r.compAmount, angle: r.compAngle }, turb: { amount: r.turbAmount, angle: r.turbAngle } }
	};
}

function stationId(tx: DbOrTx, code: string | null | undefined): number | null | 'unknown' {
	if (!code) return null;
	const s = tx.select({ id: station.id }).from(station).where(eq(station.code, code)).get();
	return s ? s.id : 'unknown';
}

function notReady(u: Unit, needs: UnitState, what: string): string | null {
	if (u.held) return `${u.serial} is on hold (${u.holdReason ?? 'no reason given'}); release it before recording ${what}.`;
	if (u.state !== needs) return `${u.serial} is ${u.state}; ${what} is recorded while it is ${needs}.`;
	return null;
}

export interface RecordedRun {
	run: BalanceRun;
	evaluation: Evaluation | null;
}

/** Record one balance run; the server works out the verdict from the spec and the earlier runs. */
export function recordBalanceRun(
	db: Db,
	actor: Actor,
	serial: string,
	raw: unknown,
	opts: { stationCode?: string | null; now?: Date } = {}
): RecordResult<RecordedRun> {
	const parsed = balanceRunInput.safeParse(raw);
	if (!parsed.success) return { ok: false, status: 400, message: parsed.error.issues[0]?.message ?? 'Check the run.', fields: zodFields(parsed.error) };
	const input: BalanceRunInput = parsed.data;
	const now = opts.now ?? new Date();
	return db.transaction(
		(tx): RecordResult<RecordedRun> => {
			const u = tx.select().from(unit).where(eq(unit.serial, serial)).get();
			if (!u) return { ok: false, status: 404, message: `No unit ${serial} in the shop.` };
			const why = notReady(u, 'assembled', 'a balance run');
			if (why) return { ok: false, status: 409, message: why };
			const spec = specForModel(tx, u.modelId);
			if (!spec) return { ok: false, status: 409, message: `${serial}: its model has no balance spec yet; the owner sets it under Models.` };
			const sid = stationId(tx, opts.stationCode);
			if (sid === 'unknown') return { ok: false, status: 400, message: `No station ${opts.stationCode}.` };
			const earlier = currentBuildRuns(tx, u.id);
			const numbers = specNumbers(spec);
			const reading = { comp: { amount: input.compAmount, angle: input.compAngle }, turb: { amount: input.turbAmount, angle: input.turbAngle } };
			let evaluation: Evaluation | null = null;
			let ev: Evaluation;
			try {
				if (input.kind !== 'trial') evaluation = evaluate(numbers, earlier.map(runLike), reading);
				ev = evaluation ?? evaluate(numbers, [], reading);
			} catch (e) {
				// A meaningless number (or trial runs that cannot tell the planes apart): the sentence, and nothing stored.
				return { ok: false, status: 400, message: badNumberMessage(e) ?? 'These readings cannot be worked out; check the amounts and angles.' };
			}
			const lastNo = tx.select({ n: max(balanceRun.runNo) }).from(balanceRun).where(eq(balanceRun.unitId, u.id)).get()?.n ?? 0;
			const row = tx
				.insert(balanceRun)
				.values({
					unitId: u.id,
					runNo: lastNo + 1,
					afterSeq: u.version,
					kind: input.kind,
					trialPlane: input.kind === 'trial' ? input.trialPlane : null,
					trialAmount: input.kind === 'trial' ? input.trialAmount : null,
					trialAngle: input.kind === 'trial' ? input.trialAngle : null,
					unbalanceUnit: numbers.unbalanceUnit,
					compAmount: input.compAmount,
					compAngle: input.compAngle,
					turbAmount: input.turbAmount,
					turbAngle: input.turbAngle,
					speedRpm: input.speedRpm,
					method: evaluation ? evaluation.method : 'trial',
					residualCompGmm: evaluation ? evaluation.verdict.planes[0].residualGmm : null,
					residualTurbGmm: evaluation ? evaluation.verdict.planes[1].residualGmm : null,
					tolCompGmm: ev.allocation.planes[0].tolGmm,
					tolTurbGmm: ev.allocation.planes[1].tolGmm,
					passed: evaluation ? evaluation.verdict.pass : false,
					correction: evaluation && !evaluation.verdict.pass ? { corrections: evaluation.corrections } : null,
					compWheelSerial: input.compWheelSerial,
					shaftWheelSerial: input.shaftWheelSerial,
					userId: actor.id,
					stationId: sid,
					at: now,
					note: input.note
				})
				.returning()
				.get();
			return { ok: true, record: { run: row, evaluation } };
		},
		{ behavior: 'immediate' }
	);
}

/**
 * Record the assembly of a unit. Out of limits is refused with the reasons, unless a lead or
 * the owner records it as a deviation with a reason.
 */
export function recordAssembly(
	db: Db,
	actor: Actor,
	serial: string,
	raw: unknown,
	opts: { stationCode?: string | null; now?: Date } = {}
): RecordResult<AssemblyRecord> {
	const parsed = assemblyInput.safeParse(raw);
	if (!parsed.success) return { ok: false, status: 400, message: parsed.error.issues[0]?.message ?? 'Check the record.', fields: zodFields(parsed.error) };
	const input: AssemblyInput = parsed.data;
	const now = opts.now ?? new Date();
	return db.transaction(
		(tx): RecordResult<AssemblyRecord> => {
			const u = tx.select().from(unit).where(eq(unit.serial, serial)).get();
			if (!u) return { ok: false, status: 404, message: `No unit ${serial} in the shop.` };
			const why = notReady(u, 'painted', 'the assembly record');
			if (why) return { ok: false, status: 409, message: why };
			const spec = specForModel(tx, u.modelId);
			if (!spec) return { ok: false, status: 409, message: `${serial}: its model has no assembly limits yet; the owner sets them under Models.` };
			const sid = stationId(tx, opts.stationCode);
			if (sid === 'unknown') return { ok: false, status: 400, message: `No station ${opts.stationCode}.` };
			let findings: string[];
			try {
				findings = assemblyFindings(spec, input);
			} catch (e) {
				const message = badNumberMessage(e);
				if (message === null) throw e;
				return { ok: false, status: 400, message };
			}
			const deviation = findings.length > 0 && input.deviationReason !== null;
			if (findings.length > 0 && !deviation) {
				return { ok: false, status: 409, message: `Refused: ${findings.join(' ')}`, fields: { _: findings } };
			}
			if (deviation && !STEERING_ROLES.includes(actor.role)) {
				return { ok: false, status: 403, message: `Only a lead or the owner may record a deviation. ${findings.join(' ')}` };
			}
			const row = tx
				.insert(assemblyRecord)
				.values({
					unitId: u.id,
					afterSeq: u.version,
					endPlayMm: input.endPlayMm,
					radialPlayMm: input.radialPlayMm,
					bearingKitLot: input.bearingKitLot,
					sealKitLot: input.sealKitLot,
					compWheelSerial: input.compWheelSerial,
					shaftWheelSerial: input.shaftWheelSerial,
					wastegatePresetKpa: input.wastegatePresetKpa,
					withinLimits: findings.length === 0,
					findings,
					deviationReason: deviation ? input.deviationReason : null,
					approvedBy: deviation ? actor.id : null,
					userId: actor.id,
					stationId: sid,
					at: now,
					note: input.note
				})
				.returning()
				.get();
			return { ok: true, record: row };
		},
		{ behavior: 'immediate' }
	);
}

export interface BuildRecordView {
	runs: (BalanceRun & { userName: string | null; stationName: string | null })[];
	assemblies: (AssemblyRecord & { userName: string | null; approverName: string | null })[];
}

/** Every balance run and assembly record of a unit, oldest first, with names. */
export function buildRecord(db: DbOrTx, unitId: number): BuildRecordView {
	const runs = db
		.select({ run: balanceRun, userName: user.name, stationName: station.name })
		.from(balanceRun)
		.leftJoin(user, eq(user.id, balanceRun.userId))
		.leftJoin(station, eq(station.id, balanceRun.stationId))
		.where(eq(balanceRun.unitId, unitId))
		.orderBy(asc(balanceRun.runNo))
		.all()
		.map((r) => ({ ...r.run, userName: r.userName, stationName: r.stationName }));
	const rows = db.select({ rec: assemblyRecord, userName: user.name }).from(assemblyRecord).leftJoin(user, eq(user.id, assemblyRecord.userId)).where(eq(assemblyRecord.unitId, unitId)).orderBy(asc(assemblyRecord.id)).all();
	const names = new Map(db.select({ id: user.id, name: user.name }).from(user).all().map((u) => [u.id, u.name]));
	return { runs, assemblies: rows.map((r) => ({ ...r.rec, userName: r.userName, approverName: r.rec.approvedBy ? (names.get(r.rec.approvedBy) ?? null) : null })) };
}

/** The latest wheel serials recorded for a unit (to prefill the balance form). */
export function latestWheelSerials(db: DbOrTx, unitId: number): { compWheelSerial: string; shaftWheelSerial: string } | null {
	const r = db.select().from(assemblyRecord).where(eq(assemblyRecord.unitId, unitId)).orderBy(desc(assemblyRecord.id)).limit(1).get();
	return r ? { compWheelSerial: r.compWheelSerial, shaftWheelSerial: r.shaftWheelSerial } : null;
}

export type { PlaneKey };

/** The station a bench move is made at: the one named, else the first active station of the stage. */
export function benchStation(db: DbOrTx, stage: 'balance' | 'assemble', code: string | null): { code: string; name: string } | null {
	const rows = db.select().from(station).where(and(eq(station.stage, stage), eq(station.active, true))).orderBy(asc(station.sortOrder)).all();
	const s = (code ? rows.find((r) => r.code === code) : undefined) ?? rows[0];
	return s ? { code: s.code, name: s.name } : null;
}

/** Everything the balance and assembly pages show about a unit's build. */
export function benchContext(db: DbOrTx, serial: string) {
	const u = db.select().from(unit).where(eq(unit.serial, serial)).get();
	if (!u) return null;
	const spec = specForModel(db, u.modelId);
	return {
		unitId: u.id,
		spec: spec ? specNumbers(spec) : null,
		sources: spec?.sources ?? null,
		demo: spec?.demo ?? false,
		currentRuns: currentBuildRuns(db, u.id),
		currentAssemblies: currentAssemblyRecords(db, u.id),
		record: buildRecord(db, u.id),
		wheels: latestWheelSerials(db, u.id)
	};
}
