import { fail } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { addScrapReason, allScrapReasons, renameScrapReason, setScrapReasonActive } from '$lib/server/floor-settings';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({ reasons: allScrapReasons(getDb()) });

const text = (form: FormData, name: string) => String(form.get(name) ?? '').slice(0, 200);

export const actions: Actions = {
	add: async ({ request }) => {
		const form = await request.formData();
		const r = addScrapReason(getDb(), { code: text(form, 'code'), label: text(form, 'label'), category: text(form, 'category') });
		if (!r.ok) return fail(400, { error: r.message, values: { code: text(form, 'code'), label: text(form, 'label'), category: text(form, 'category') } });
		return { saved: `Added ${text(form, 'code').toUpperCase()}.` };
	},
	rename: async ({ request }) => {
		const form = await request.formData();
		const r = renameScrapReason(getDb(), text(form, 'code'), text(form, 'label'));
		if (!r.ok) return fail(400, { error: r.message });
		return { saved: `Renamed ${text(form, 'code')}.` };
	},
	toggle: async ({ request }) => {
		const form = await request.formData();
		const active = text(form, 'active') === '1';
		const r = setScrapReasonActive(getDb(), text(form, 'code'), active);
		if (!r.ok) return fail(400, { error: r.message });
		return { saved: `${text(form, 'code')} ${active ? 'is in use again' : 'is no longer offered'}.` };
	}
};
