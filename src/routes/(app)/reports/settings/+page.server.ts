import { fail } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { labourRateCents, labourRateSchema, setLabourRateCents } from '$lib/server/reports/settings';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({ ratePerHour: labourRateCents(getDb()) / 100 });

export const actions: Actions = {
	default: async ({ request }) => {
		const form = await request.formData();
		const raw = String(form.get('ratePerHour') ?? '').trim();
		const parsed = labourRateSchema.safeParse({ ratePerHour: raw === '' ? undefined : raw });
		if (!parsed.success) return fail(400, { ratePerHour: raw, error: parsed.error.issues[0]?.message ?? 'Check the labour rate.' });
		const db = getDb();
		db.transaction((tx) => setLabourRateCents(tx, parsed.data.ratePerHour * 100), { behavior: 'immediate' });
		return { saved: true, ratePerHour: parsed.data.ratePerHour };
	}
};
