import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { normalizeSerial } from '$lib/domain/units/serial';
import { getDb } from '$lib/server/db';
import { reportOptions } from '$lib/server/reports/options';
import { linkWarrantyReturn } from '$lib/server/reports/warranty';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => reportOptions(getDb());

const linkSchema = z.object({
	returnSerial: z.string().trim().min(1, 'Give the serial of the returned unit.'),
	originalSerial: z.string().trim().min(1, 'Give the serial it shipped under.')
});

export const actions: Actions = {
	link: async ({ request }) => {
		const form = Object.fromEntries(await request.formData());
		const values = { returnSerial: String(form.returnSerial ?? ''), originalSerial: String(form.originalSerial ?? '') };
		const parsed = linkSchema.safeParse(values);
		if (!parsed.success) return fail(400, { ...values, error: parsed.error.issues[0]?.message ?? 'Check the serials.' });
		const ret = normalizeSerial(parsed.data.returnSerial);
		const orig = normalizeSerial(parsed.data.originalSerial);
		if (!ret) return fail(400, { ...values, error: `${parsed.data.returnSerial} is not a shop serial (SY- and five digits).` });
		if (!orig) return fail(400, { ...values, error: `${parsed.data.originalSerial} is not a shop serial (SY- and five digits).` });
		const db = getDb();
		const result = db.transaction((tx) => linkWarrantyReturn(tx, ret, orig), { behavior: 'immediate' });
		if (!result.ok) return fail(400, { ...values, error: result.message });
		return { linked: `${ret} is linked to ${orig}.` };
	}
};
