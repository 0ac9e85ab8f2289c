import { error, fail } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { getModelWithSpec, saveSpec, specNumbers } from '$lib/server/balance';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const m = getModelWithSpec(getDb(), params.code);
	if (!m) error(404, { message: `No model ${params.code}.` });
	return {
		model: { code: m.code, family: m.family, description: m.description },
		spec: m.spec ? specNumbers(m.spec) : null,
		sources: m.spec?.sources ?? null,
		demo: m.spec?.demo ?? false,
		updatedAt: m.spec?.updatedAt.toISOString() ?? null,
		canEdit: locals.user!.role === 'owner'
	};
};

export const actions: Actions = {
	save: async ({ request, params, locals }) => {
		const form = await request.formData();
		const values: Record<string, string> = {};
		const sources: Record<string, string> = {};
		for (const [k, v] of form.entries()) {
			if (typeof v !== 'string') continue;
			if (k.startsWith('src_')) sources[k.slice(4)] = v;
			else values[k] = v.slice(0, 100);
		}
		const user = locals.user!;
		const r = saveSpec(getDb(), { id: user.id, role: user.role }, params.code, values, sources);
		if (!r.ok) return fail(r.status, { ok: false as const, message: r.message, fields: r.fields ?? {}, values, sources });
		return { ok: true as const };
	}
};
