import { getDb } from '$lib/server/db';
import { listModelsWithSpecs, specNumbers } from '$lib/server/balance';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => ({
	models: listModelsWithSpecs(getDb()).map((m) => ({
		code: m.code,
		family: m.family,
		description: m.description,
		spec: m.spec ? specNumbers(m.spec) : null,
		demo: m.spec?.demo ?? false
	}))
});
