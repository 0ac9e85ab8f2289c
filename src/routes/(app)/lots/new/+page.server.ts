import { fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { lotFormSchema } from '$lib/domain/lots/lot';
import { getDb } from '$lib/server/db';
import { createLot } from '$lib/server/lots';
import { listSuppliers } from '$lib/server/suppliers';
import type { Actions, PageServerLoad } from './$types';

const today = () => new Date().toISOString().slice(0, 10);

export const load: PageServerLoad = async ({ url }) => {
	const supplier = url.searchParams.get('supplier') ?? '';
	const form = await superValidate(
		{ receivedOn: today(), source: 'purchased_skid', costPerCore: '0.00', supplierId: supplier, expectedCount: 0, notes: '' },
		zod4(lotFormSchema(today())),
		{ errors: false }
	);
	return { form, suppliers: listSuppliers(getDb(), { activeOnly: true }) };
};

export const actions: Actions = {
	default: async ({ request }) => {
		const posted = await request.formData();
		const form = await superValidate(posted, zod4(lotFormSchema(today())));
		// a blank count would be read as 0; it is refused, and "0" typed on purpose is a count
		if (String(posted.get('expectedCount') ?? '').trim() === '') return setError(form, 'expectedCount', 'Give how many cores the lot should hold (type 0 if none are expected yet).');
		if (!form.valid) return fail(400, { form });
		const result = createLot(getDb(), form.data, today());
		if (!result.ok) return setError(form, result.field, result.message);
		redirect(303, `/lots/${result.code}?created=1`);
	}
};
