import { error, fail } from '@sveltejs/kit';
import { FLOOR_ROLES } from '$lib/domain/auth/roles';
import { newKey } from '$lib/ids';
import { BALANCE_RUN_KEYS } from '$lib/domain/balance/records';
import { getDb } from '$lib/server/db';
import { benchContext, benchStation, recordBalanceRun } from '$lib/server/balance';
import { applyMove, findUnitView } from '$lib/server/units';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals, url }) => {
	const db = getDb();
	const unit = findUnitView(db, params.serial);
	if (!unit) error(404, { message: `No unit ${params.serial} in the shop.` });
	const ctx = benchContext(db, params.serial)!;
	return {
		unit,
		...ctx,
		station: benchStation(db, 'balance', url.searchParams.get('station')),
		canRecord: FLOOR_ROLES.includes(locals.user!.role),
		key: newKey('bal')
	};
};

/** The form's own fields (the record's, plus the form's controls), each cut to 500 characters; anything else is ignored. */
function fields(form: FormData, names: readonly string[]): Record<string, string> {
	const out: Record<string, string> = {};
	for (const k of names) {
		const v = form.get(k);
		if (typeof v === 'string') out[k] = v.slice(0, 500);
	}
	return out;
}

export const actions: Actions = {
	record: async ({ request, params, locals, url }) => {
		const values = fields(await request.formData(), BALANCE_RUN_KEYS);
		const db = getDb();
		const station = benchStation(db, 'balance', url.searchParams.get('station'));
		const user = locals.user!;
		const r = recordBalanceRun(db, { id: user.id, role: user.role }, params.serial, values, { stationCode: station?.code ?? null });
		if (!r.ok) return fail(r.status, { record: { ok: false as const, message: r.message, fields: r.fields ?? {} }, values });
		return { record: { ok: true as const, runNo: r.record.run.runNo, passed: r.record.run.passed, kind: r.record.run.kind } };
	},
	balanced: async ({ request, params, locals, url }) => {
		const form = await request.formData();
		const db = getDb();
		const station = benchStation(db, 'balance', url.searchParams.get('station'));
		const user = locals.user!;
		const key = String(form.get('idempotencyKey') ?? '');
		const r = applyMove(db, { id: user.id, role: user.role }, {
			serial: params.serial,
			action: 'balance',
			stationCode: station?.code ?? null,
			idempotencyKey: /^[\w:.-]{8,100}$/.test(key) ? key : newKey('bal')
		});
		if (!r.ok) return fail(r.status, { move: { ok: false as const, message: r.message } });
		return { move: { ok: true as const, state: r.unit.state } };
	}
};
