import { error, fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { Role } from '$lib/domain/auth/roles';
import { supplierSchema } from '$lib/domain/lots/lot';
import { zodFields } from '$lib/server/http';
import { getDb } from '$lib/server/db';
import { DuplicateSupplierError, SUPPLIER_EDITORS, createSupplier, listSuppliers, updateSupplier } from '$lib/server/suppliers';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	return {
		suppliers: listSuppliers(getDb()),
		canEdit: SUPPLIER_EDITORS.includes(locals.user!.role),
		form: await superValidate(zod4(supplierSchema))
	};
};

function mustEdit(role: Role) {
	if (!SUPPLIER_EDITORS.includes(role)) error(403, { message: 'Only the office and the owner keep the supplier list.' });
}

export const actions: Actions = {
	create: async ({ request, locals }) => {
		mustEdit(locals.user!.role);
		const form = await superValidate(request, zod4(supplierSchema));
		if (!form.valid) return fail(400, { form });
		try {
			const s = createSupplier(getDb(), form.data);
			return message(form, `${s.name} added.`);
		} catch (e) {
			if (e instanceof DuplicateSupplierError) return setError(form, 'name', e.message);
			throw e;
		}
	},
	update: async ({ request, locals }) => {
		mustEdit(locals.user!.role);
		const body = await request.formData();
		const id = Number(body.get('id'));
		const parsed = supplierSchema.safeParse({ name: String(body.get('name') ?? ''), notes: String(body.get('notes') ?? '') });
		if (!Number.isInteger(id) || id < 1) return fail(400, { editId: id, editError: 'No such supplier.' });
		if (!parsed.success) {
			const fields = zodFields(parsed.error);
			return fail(400, { editId: id, editError: fields.name?.[0] ?? fields.notes?.[0] ?? 'Check the fields.' });
		}
		try {
			if (!updateSupplier(getDb(), id, { ...parsed.data, active: body.get('active') === 'on' })) return fail(404, { editId: id, editError: 'No such supplier.' });
		} catch (e) {
			if (e instanceof DuplicateSupplierError) return fail(400, { editId: id, editError: e.message });
			throw e;
		}
		return { editId: id, saved: `${parsed.data.name} saved.` };
	}
};
