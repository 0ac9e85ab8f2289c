import { error, fail } from '@sveltejs/kit';
import { FLOOR_ROLES, STEERING_ROLES } from '$lib/domain/auth/roles';
import { newKey } from '$lib/ids';
import { ASSEMBLY_KEYS } from '$lib/domain/balance/records';
import { getDb } from '$lib/server/db';
import { benchContext, benchStation, recordAssembly } from '$lib/server/balance';
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
		station: benchStation(db, 'assemble', url.searchParams.get('station')),
		canRecord: FLOOR_ROLES.includes(locals.user!.role),
		canDeviate: STEERING_ROLES.includes(locals.user!.role),
		key: newKey('asm')
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
		const values = fields(await request.formData(), [...ASSEMBLY_KEYS, 'deviate']);
		const db = getDb();
		const station = benchStation(db, 'assemble', url.searchParams.get('station'));
		const user = locals.user!;
		// A deviation is only sent when the lead ticked it; the service checks the role again.
		const { deviate, ...rec } = values;
		if (deviate !== 'on') delete rec.deviationReason;
		const r = recordAssembly(db, { id: user.id, role: user.role }, params.serial, rec, { stationCode: station?.code ?? null });
		if (!r.ok) return fail(r.status, { record: { ok: false as const, message: r.message, fields: r.fields ?? {} }, values });
		return { record: { ok: true as const, withinLimits: r.record.withinLimits } };
	},
	assembled: async ({ request, params, locals, url }) => {
		const form = await request.formData();
		const db = getDb();
		const station = benchStation(db, 'assemble', url.searchParams.get('station'));
		const user = locals.user!;
		const key = String(form.get('idempotencyKey') ?? '');
		const r = applyMove(db, { id: user.id, role: user.role }, {
			serial: params.serial,
			action: 'assemble',
			stationCode: station?.code ?? null,
			idempotencyKey: /^[\w:.-]{8,100}$/.test(key) ? key : newKey('asm')
		});
		if (!r.ok) return fail(r.status, { move: { ok: false as const, message: r.message } });
		return { move: { ok: true as const, state: r.unit.state } };
	}
};
