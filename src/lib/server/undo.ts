/**
 * Undo a move: the rule is in the domain (`units/undo.ts`); here it runs inside one immediate
 * transaction that appends the compensating `undo` event and updates the unit row.
 */
import { and, asc, eq } from 'drizzle-orm';
import { decideUndo } from '../domain/units/undo';
import type { Db } from './db';
import { station, unit, unitEvent } from './db/schema';
import { publish } from './live';
import { moveStall } from './move-stall';
import { findUnitView, type Actor, type UnitView } from './units';

export type UndoResult =
	| { ok: true; status: 200 | 201; replayed: boolean; unit: UnitView; undoneSeq: number; undoneAction: string }
	| { ok: false; status: 400 | 404 | 409 | 422; code: string; message: string; unit?: UnitView };

export interface UndoInput {
	serial: string;
	/** The move the person means to undo; the last one when absent. */
	seq?: number;
	stationCode?: string | null;
	idempotencyKey: string;
}

export function undoLastMove(db: Db, actor: Actor, input: UndoInput, now: Date = new Date()): UndoResult {
	const result = db.transaction(
		(tx): UndoResult => {
			const prior = tx
				.select({ event: unitEvent, serial: unit.serial })
				.from(unitEvent)
				.innerJoin(unit, eq(unit.id, unitEvent.unitId))
				.where(eq(unitEvent.idempotencyKey, input.idempotencyKey))
				.get();
			if (prior) {
				if (prior.serial !== input.serial || prior.event.action !== 'undo') {
					return { ok: false, status: 422, code: 'key_reused', message: 'This request key was already used for a different move; send a new key.' };
				}
				const d = prior.event.data ?? {};
				return { ok: true, status: 200, replayed: true, unit: findUnitView(tx, input.serial)!, undoneSeq: Number(d.undoesSeq), undoneAction: String(d.undoesAction) };
			}
			const row = tx.select().from(unit).where(eq(unit.serial, input.serial)).get();
			if (!row) return { ok: false, status: 404, code: 'not_found', message: `No unit ${input.serial} in the shop.` };
			moveStall?.();
			let stationId: number | null = null;
			if (input.stationCode) {
				const s = tx.select().from(station).where(eq(station.code, input.stationCode)).get();
				if (!s) return { ok: false, status: 400, code: 'invalid', message: `No station ${input.stationCode}.` };
				stationId = s.id;
			}
			const history = tx
				.select()
				.from(unitEvent)
				.where(eq(unitEvent.unitId, row.id))
				.orderBy(asc(unitEvent.seq))
				.all();
			const decision = decideUndo(row.serial, history, { userId: actor.id, seq: input.seq }, now);
			if (!decision.ok) return { ok: false, status: 409, code: 'refused', message: decision.message, unit: findUnitView(tx, row.serial)! };
			const undone = history[history.length - 1];
			const seq = row.version + 1;
			tx.insert(unitEvent)
				.values({
					unitId: row.id,
					seq,
					fromState: decision.from,
					toState: decision.to,
					action: 'undo',
					stationId: stationId ?? undone.stationId,
					userId: actor.id,
					at: now,
					idempotencyKey: input.idempotencyKey,
					data: { undoesSeq: decision.undoesSeq, undoesAction: decision.undoesAction, held: decision.held, holdReason: decision.holdReason }
				})
				.run();
			const updated = tx
				.update(unit)
				.set({
					state: decision.to,
					held: decision.held,
					holdReason: decision.holdReason,
					version: seq,
					stateSince: decision.to !== row.state ? decision.stateSince : row.stateSince,
					updatedAt: now
				})
				.where(and(eq(unit.id, row.id), eq(unit.version, row.version)))
				.run();
			if (updated.changes !== 1) throw new Error(`lost update on ${row.serial}`);
			return { ok: true, status: 201, replayed: false, unit: findUnitView(tx, row.serial)!, undoneSeq: decision.undoesSeq, undoneAction: decision.undoesAction };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok && !result.replayed) {
		publish({
			topic: 'unit',
			kind: 'undo',
			serial: result.unit.serial,
			state: result.unit.state,
			held: result.unit.held,
			version: result.unit.version,
			stationCode: input.stationCode ?? null,
			at: now.toISOString()
		});
	}
	return result;
}
