import { fail } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { buildPlan, setAlpha, suggestionToCard } from '$lib/server/plan';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => ({
	plan: buildPlan(getDb()),
	canSetAlpha: locals.user!.role === 'owner'
});

export const actions: Actions = {
	alpha: async ({ request, locals }) => {
		const form = await request.formData();
		const value = Number(form.get('alpha'));
		const u = locals.user!;
		if (u.role !== 'owner') return fail(403, { message: 'Only the owner sets the smoothing constant.' });
		const r = setAlpha(getDb(), { id: u.id, role: u.role }, value);
		if (!r.ok) return fail(400, { message: r.message });
		return { done: `α is now ${value}.` };
	},
	card: async ({ request, locals }) => {
		const form = await request.formData();
		const model = String(form.get('model') ?? '');
		const u = locals.user!;
		const r = suggestionToCard(getDb(), { id: u.id, role: u.role }, model);
		if (!r.ok) return fail(r.status, { message: r.message });
		const short = r.short ? ` Only ${r.card.unitCount} free cores were waiting; ${r.short} more are needed.` : '';
		return { done: `Card “${r.card.title}” is on the board at ${r.card.rank}.${short}` };
	}
};
