import { describe, expect, test } from 'vitest';
import { decide, replay } from '../../src/lib/domain/units/machine';
import { UNDO_WINDOW_MS, decideUndo, type UndoHistoryEntry } from '../../src/lib/domain/units/undo';

const t0 = new Date('2026-12-01T08:00:00Z');
const at = (ms: number) => new Date(t0.getTime() + ms);

function history(): UndoHistoryEntry[] {
	return [
		{ seq: 1, action: 'receive', fromState: null, toState: 'received', userId: 'office', at: at(0) },
		{ seq: 2, action: 'inspect', fromState: 'received', toState: 'inspected', userId: 'rui', at: at(3_600_000) },
		{ seq: 3, action: 'accept', fromState: 'inspected', toState: 'accepted', userId: 'rui', at: at(3_700_000) }
	];
}

describe('decideUndo', () => {
	test('the maker may undo their own last move inside the window; it returns the unit to the state before', () => {
		const d = decideUndo('SY-00001', history(), { userId: 'rui' }, at(3_700_000 + 60_000));
		expect(d).toMatchObject({ ok: true, undoesSeq: 3, undoesAction: 'accept', from: 'accepted', to: 'inspected', held: false, stateSince: at(3_600_000) });
	});

	test('exactly at the two-minute mark is still allowed; a millisecond later is too late', () => {
		expect(decideUndo('SY-00001', history(), { userId: 'rui' }, at(3_700_000 + UNDO_WINDOW_MS)).ok).toBe(true);
		const late = decideUndo('SY-00001', history(), { userId: 'rui' }, at(3_700_000 + UNDO_WINDOW_MS + 1));
		expect(late).toEqual({ ok: false, message: 'The last move on SY-00001 was made more than 2 minutes ago; ask the lead to correct it.' });
	});

	test('another user may not undo it', () => {
		const d = decideUndo('SY-00001', history(), { userId: 'dana' }, at(3_700_000 + 1000));
		expect(d).toEqual({ ok: false, message: 'Only the person who made the last move on SY-00001 can undo it; ask the lead.' });
	});

	test('only the last event can be undone', () => {
		const d = decideUndo('SY-00001', history(), { userId: 'rui', seq: 2 }, at(3_700_000 + 1000));
		expect(d).toEqual({ ok: false, message: 'Only the last move on SY-00001 can be undone; it has moved since.' });
	});

	test('an undone move cannot be undone again, nor can the undo itself', () => {
		const h = history();
		h.push({ seq: 4, action: 'undo', fromState: 'accepted', toState: 'inspected', userId: 'rui', at: at(3_760_000), data: { held: false, undoesSeq: 3 } });
		expect(decideUndo('SY-00001', h, { userId: 'rui' }, at(3_770_000))).toEqual({ ok: false, message: 'The last move on SY-00001 is already undone.' });
		expect(decideUndo('SY-00001', h, { userId: 'rui', seq: 3 }, at(3_770_000)).ok).toBe(false);
	});

	test('terminal moves (scrap, ship) and the receipt cannot be undone', () => {
		const scrapped = history().slice(0, 2);
		scrapped.push({ seq: 3, action: 'scrap', fromState: 'inspected', toState: 'scrapped', userId: 'rui', at: at(3_700_000), data: { reasonCode: 'BORE' } });
		expect(decideUndo('SY-00001', scrapped, { userId: 'rui' }, at(3_700_500))).toEqual({
			ok: false,
			message: 'SY-00001 is scrapped; that cannot be undone from a station. Ask the lead to correct it.'
		});
		const shipped: UndoHistoryEntry[] = [
			{ seq: 1, action: 'receive', fromState: null, toState: 'received', userId: 'office', at: at(0) },
			{ seq: 2, action: 'ship', fromState: 'packed', toState: 'shipped', userId: 'rui', at: at(1000) }
		];
		expect(decideUndo('SY-00002', shipped, { userId: 'rui' }, at(2000)).ok).toBe(false);
		expect(decideUndo('SY-00003', history().slice(0, 1), { userId: 'office' }, at(1000))).toMatchObject({ ok: false });
	});

	test('undoing a hold restores the unit to not held; undoing a release restores the hold and its reason', () => {
		const h = history();
		h.push({ seq: 4, action: 'hold', fromState: 'accepted', toState: 'accepted', userId: 'rui', at: at(3_800_000), data: { reason: 'Waiting for a wheel' } });
		const undoHold = decideUndo('SY-00001', h, { userId: 'rui' }, at(3_800_100));
		expect(undoHold).toMatchObject({ ok: true, to: 'accepted', held: false, holdReason: null });
		h.push({ seq: 5, action: 'release', fromState: 'accepted', toState: 'accepted', userId: 'rui', at: at(3_900_000) });
		const undoRelease = decideUndo('SY-00001', h, { userId: 'rui' }, at(3_900_100));
		expect(undoRelease).toMatchObject({ ok: true, to: 'accepted', held: true, holdReason: 'Waiting for a wheel' });
	});

	test('the compensating entry replays to the state before the undone move', () => {
		const h = history();
		const d = decideUndo('SY-00001', h, { userId: 'rui' }, at(3_710_000));
		if (!d.ok) throw new Error(d.message);
		const after = [...h, { seq: 4, action: 'undo', fromState: d.from, toState: d.to, userId: 'rui', at: at(3_710_000), data: { held: d.held, holdReason: d.holdReason } }];
		expect(replay('SY-00001', after)).toEqual({ state: 'inspected', held: false, holdReason: null });
		// and the state machine lets the unit be given its verdict again
		expect(decide({ serial: 'SY-00001', state: 'inspected', held: false, holdReason: null }, { action: 'accept', role: 'tech', stationStage: 'teardown' }).ok).toBe(true);
	});
});
