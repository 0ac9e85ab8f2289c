import { error, fail } from '@sveltejs/kit';
import { FLOOR_ROLES } from '$lib/domain/auth/roles';
import { actionDataKeys, isActionName, type ActionName } from '$lib/domain/units/actions';
import { normalizeSerial } from '$lib/domain/units/serial';
import { newKey } from '$lib/ids';
import { getDb } from '$lib/server/db';
import { listScrapReasons } from '$lib/server/scrap-reasons';
import { stationBoard } from '$lib/server/board';
import { getStation } from '$lib/server/stations';
import { applyMove, scanAtStation, type MoveResult } from '$lib/server/units';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const db = getDb();
	const station = getStation(db, params.code);
	if (!station) error(404, { message: `No station ${params.code}.` });
	return {
		station,
		// the board carries the waiting list, the work in hand and today's moves
		board: stationBoard(db, station.code)!,
		scrapReasons: listScrapReasons(db),
		canScan: FLOOR_ROLES.includes(locals.user!.role),
		key: newKey('scan')
	};
};

type Outcome =
	| { ok: true; serial: string; to: string; done: string; held: boolean; replayed: boolean }
	| { ok: false; serial: string | null; message: string; fields?: Record<string, string[]> };

function outcome(result: MoveResult, serial: string | null, done: string) {
	if (result.ok) {
		const o: Outcome = {
			ok: true,
			serial: result.unit.serial,
			to: result.unit.state,
			done,
			held: result.unit.held,
			replayed: result.replayed
		};
		return { outcome: o };
	}
	const o: Outcome = { ok: false, serial, message: result.message, fields: result.fields };
	return fail(result.status, { outcome: o });
}

function field(form: FormData, name: string): string {
	const v = form.get(name);
	return typeof v === 'string' ? v.slice(0, 2000) : '';
}

function keyOf(form: FormData): string {
	const key = field(form, 'idempotencyKey');
	return /^[\w:.-]{8,100}$/.test(key) ? key : newKey('form');
}

export const actions: Actions = {
	scan: async ({ request, params, locals }) => {
		const form = await request.formData();
		const raw = field(form, 'serial');
		const user = locals.user!;
		const result = scanAtStation(getDb(), { id: user.id, role: user.role }, params.code, raw, keyOf(form));
		return outcome(result, normalizeSerial(raw), 'scan');
	},
	move: async ({ request, params, locals }) => {
		const form = await request.formData();
		const serial = normalizeSerial(field(form, 'serial'));
		const action = field(form, 'action');
		if (!serial) return fail(400, { outcome: { ok: false, serial: null, message: 'Scan or type a shop serial first.' } as Outcome });
		if (!isActionName(action) || action === 'receive') {
			return fail(400, { outcome: { ok: false, serial, message: 'Unknown action.' } as Outcome });
		}
		// only the fields this move declares (the station's forms send reasonCode, reason and toStage)
		const data: Record<string, unknown> = {};
		for (const name of ['reasonCode', 'reason', 'toStage'].filter((k) => actionDataKeys(action).includes(k))) {
			const v = field(form, name);
			if (v) data[name] = v;
		}
		const user = locals.user!;
		const result = applyMove(getDb(), { id: user.id, role: user.role }, {
			serial,
			action: action as ActionName,
			stationCode: params.code,
			idempotencyKey: keyOf(form),
			note: field(form, 'note') || null,
			data
		});
		return outcome(result, serial, action);
	}
};
