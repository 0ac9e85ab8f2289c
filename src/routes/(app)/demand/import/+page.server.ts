import { fail } from '@sveltejs/kit';
import { ORDER_FIELDS, guessMapping, type OrderMapping } from '$lib/domain/orders/order-csv';
import { getDb } from '$lib/server/db';
import { importOrders, previewOrderImport } from '$lib/server/orders';
import type { Actions, PageServerLoad } from './$types';

const MAX_BYTES = 1_000_000;

export const load: PageServerLoad = async () => ({ fields: ORDER_FIELDS });

async function readText(form: FormData): Promise<{ ok: true; text: string } | { ok: false; message: string }> {
	const file = form.get('file');
	let text = typeof form.get('text') === 'string' ? (form.get('text') as string) : '';
	if (file instanceof File && file.size > 0) {
		if (file.size > MAX_BYTES) return { ok: false, message: 'The file is larger than 1 MB; split it and import the parts.' };
		text = await file.text();
	}
	if (text.length > MAX_BYTES) return { ok: false, message: 'The text is larger than 1 MB; split it and import the parts.' };
	if (!text.trim()) return { ok: false, message: 'Choose a CSV file or paste its contents.' };
	return { ok: true, text };
}

function mappingFrom(form: FormData): OrderMapping | null {
	if (form.get('mapped') !== '1') return null;
	const m: OrderMapping = {};
	for (const f of ORDER_FIELDS) {
		const v = form.get(`map_${f}`);
		if (typeof v === 'string' && v) m[f] = v;
	}
	return m;
}

export const actions: Actions = {
	preview: async ({ request }) => {
		const form = await request.formData();
		const read = await readText(form);
		if (!read.ok) return fail(400, { message: read.message });
		const preview = previewOrderImport(getDb(), read.text, mappingFrom(form), guessMapping);
		return { stage: 'preview' as const, text: read.text, preview };
	},
	import: async ({ request, locals }) => {
		const form = await request.formData();
		const read = await readText(form);
		if (!read.ok) return fail(400, { message: read.message });
		const mapping = mappingFrom(form) ?? guessMapping([]);
		const u = locals.user!;
		const r = importOrders(getDb(), { id: u.id, role: u.role }, read.text, mapping);
		if (!r.ok) {
			const preview = previewOrderImport(getDb(), read.text, mapping, guessMapping);
			return fail(r.status, { stage: 'preview' as const, text: read.text, preview, message: r.message });
		}
		return { stage: 'done' as const, done: `Imported ${r.orders} order${r.orders === 1 ? '' : 's'} with ${r.lines} line${r.lines === 1 ? '' : 's'}.` };
	}
};
