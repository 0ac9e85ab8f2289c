import { fail } from '@sveltejs/kit';
import { asc } from 'drizzle-orm';
import { addChecklistItem, createChecklist, listChecklists, setChecklistItemActive } from '$lib/server/checklists';
import { getDb } from '$lib/server/db';
import { turboModel } from '$lib/server/db/schema';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	const families = [...new Set(db.select({ f: turboModel.family }).from(turboModel).orderBy(asc(turboModel.family)).all().map((r) => r.f))];
	return { checklists: listChecklists(db), families };
};

const text = (form: FormData, name: string) => String(form.get(name) ?? '').slice(0, 200);

export const actions: Actions = {
	create: async ({ request }) => {
		const form = await request.formData();
		const r = createChecklist(getDb(), text(form, 'family'), text(form, 'name'));
		if (!r.ok) return fail(400, { error: r.message });
		return { saved: 'Checklist created; add its items.' };
	},
	addItem: async ({ request }) => {
		const form = await request.formData();
		const r = addChecklistItem(getDb(), Number(text(form, 'checklistId')), text(form, 'label'), text(form, 'measureUnit') || null);
		if (!r.ok) return fail(400, { error: r.message });
		return { saved: 'Item added.' };
	},
	toggleItem: async ({ request }) => {
		const form = await request.formData();
		const ok = setChecklistItemActive(getDb(), Number(text(form, 'itemId')), text(form, 'active') === '1');
		if (!ok) return fail(400, { error: 'No such item.' });
		return { saved: 'Item updated.' };
	}
};
