import { fail } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { assignStations, assignmentTable, setOverdueHours } from '$lib/server/floor-settings';
import { listStations } from '$lib/server/stations';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	return { stations: listStations(db), people: assignmentTable(db).filter((p) => p.role === 'tech' || p.role === 'lead') };
};

export const actions: Actions = {
	overdue: async ({ request }) => {
		const form = await request.formData();
		const code = String(form.get('code') ?? '');
		const raw = String(form.get('overdueHours') ?? '').replace(',', '.');
		const r = setOverdueHours(getDb(), code, Number(raw));
		if (!r.ok) return fail(400, { error: r.message, code });
		return { saved: `${code}: overdue after ${Number(raw)} h.` };
	},
	assign: async ({ request }) => {
		const form = await request.formData();
		const userId = String(form.get('userId') ?? '');
		const codes = form.getAll('stations').map(String);
		const r = assignStations(getDb(), userId, codes);
		if (!r.ok) return fail(400, { error: r.message });
		return { saved: 'Stations saved.' };
	}
};
