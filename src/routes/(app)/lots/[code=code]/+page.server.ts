import { error, fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { INTAKE_ROLES } from '$lib/domain/auth/roles';
import { unitDraftSchema } from '$lib/domain/lots/lot';
import { getDb } from '$lib/server/db';
import { fieldsFor } from '$lib/server/access';
import { addUnit, getLot, listModels, lotView } from '$lib/server/lots';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals, url }) => {
	const db = getDb();
	const lot = getLot(db, params.code);
	if (!lot) error(404, { message: `No lot ${params.code}.` });
	const models = listModels(db);
	const role = locals.user!.role;
	return {
		lot: { ...lot, summary: lotView(lot.summary, role) },
		fields: fieldsFor(role),
		models,
		canReceive: INTAKE_ROLES.includes(locals.user!.role),
		created: url.searchParams.get('created') === '1',
		imported: Number(url.searchParams.get('imported') ?? '') || null,
		form: await superValidate({ model: models[0]?.code ?? '', originalTag: '', notes: '' }, zod4(unitDraftSchema), { errors: false })
	};
};

export const actions: Actions = {
	add: async ({ request, params, locals }) => {
		if (!INTAKE_ROLES.includes(locals.user!.role)) error(403, { message: 'Only the office, a lead or the owner receive units.' });
		const form = await superValidate(request, zod4(unitDraftSchema));
		if (!form.valid) return fail(400, { form });
		const db = getDb();
		const lot = getLot(db, params.code);
		if (!lot) error(404, { message: `No lot ${params.code}.` });
		const result = addUnit(db, locals.user!, lot.id, form.data);
		if (!result.ok) return setError(form, result.field === 'model' ? 'model' : result.field, result.message);
		form.data.originalTag = '';
		form.data.notes = '';
		return message(form, `${result.serial} received into ${params.code}.`);
	}
};
