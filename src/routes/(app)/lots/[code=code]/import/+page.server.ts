import { error, fail } from '@sveltejs/kit';
import { MAX_IMPORT_BYTES } from '$lib/domain/import/csv-table';
import { MANIFEST_FIELDS, type ManifestKey } from '$lib/domain/lots/manifest';
import { getDb } from '$lib/server/db';
import { findLotId, getLot, importManifest, listModels, previewManifestFile, previewManifestText } from '$lib/server/lots';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const db = getDb();
	const lot = getLot(db, params.code);
	if (!lot) error(404, { message: `No lot ${params.code}.` });
	return { lot: lot.summary, units: lot.units.length, models: listModels(db).map((m) => m.code), fields: MANIFEST_FIELDS, maxBytes: MAX_IMPORT_BYTES };
};

function lotIdOr404(code: string): number {
	const id = findLotId(getDb(), code);
	if (id === null) error(404, { message: `No lot ${code}.` });
	return id;
}

function mapFrom(form: FormData): Partial<Record<ManifestKey, unknown>> {
	const out: Partial<Record<ManifestKey, unknown>> = {};
	for (const f of MANIFEST_FIELDS) out[f.key] = form.get(`map.${f.key}`) ?? '';
	return out;
}

function textFrom(form: FormData): string | null {
	const t = form.get('text');
	return typeof t === 'string' && t.length ? t : null;
}

export const actions: Actions = {
	preview: async ({ request, params }) => {
		const lotId = lotIdOr404(params.code);
		const form = await request.formData();
		const file = form.get('file');
		const text = textFrom(form);
		if (file instanceof File && (file.size > 0 || !text)) {
			if (file.size > MAX_IMPORT_BYTES) return fail(400, { step: 'error' as const, message: `The file is ${Math.ceil(file.size / 1024)} KB; the most we take at once is ${MAX_IMPORT_BYTES / 1024} KB. Split it and import the parts.` });
			const result = previewManifestFile(getDb(), lotId, new Uint8Array(await file.arrayBuffer()));
			if (!result.ok) return fail(400, { step: 'error' as const, message: result.message, fileName: file.name });
			const { text: read, ...preview } = result;
			return { step: 'preview' as const, preview, text: read, fileName: file.name, message: null as string | null };
		}
		if (!text) return fail(400, { step: 'error' as const, message: 'Choose the manifest file (CSV) first.' });
		const result = previewManifestText(getDb(), lotId, text, mapFrom(form));
		if (!result.ok) return fail(400, { step: 'error' as const, message: result.message });
		return { step: 'preview' as const, preview: result, text, fileName: String(form.get('fileName') ?? ''), message: null as string | null };
	},
	import: async ({ request, params, locals }) => {
		const lotId = lotIdOr404(params.code);
		const form = await request.formData();
		const text = textFrom(form);
		if (!text) return fail(400, { step: 'error' as const, message: 'Choose the manifest file (CSV) first.' });
		// the count the preview showed; a blank or missing count is no count (never 0)
		const rawExpected = form.get('expectedGood');
		const expected = typeof rawExpected === 'string' && /^\d{1,6}$/.test(rawExpected.trim()) ? Number(rawExpected.trim()) : -1;
		const result = importManifest(getDb(), locals.user!, lotId, text, mapFrom(form), expected);
		const fileName = String(form.get('fileName') ?? '');
		if (!result.ok) {
			if (result.preview) return fail(409, { step: 'preview' as const, preview: result.preview, text, fileName, message: result.message });
			return fail(400, { step: 'error' as const, message: result.message });
		}
		return { step: 'done' as const, serials: result.serials, skipped: result.skipped, fileName };
	}
};
