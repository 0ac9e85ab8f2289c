import { redirect } from '@sveltejs/kit';
import { STAGES, UNIT_STATES } from '$lib/domain/units/states';
import { normalizeSerial } from '$lib/domain/units/serial';
import { getDb } from '$lib/server/db';
import { findUnitView, listUnits } from '$lib/server/units';
import { filterFromUrl } from '$lib/unit-filter';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const db = getDb();
	const parsed = filterFromUrl(url);
	const filter = parsed.success ? parsed.data : {};
	// A scan into the search box jumps straight to the unit.
	const asSerial = filter.q ? normalizeSerial(filter.q) : null;
	if (asSerial && findUnitView(db, asSerial)) redirect(303, `/units/${asSerial}`);
	const { held, ...rest } = filter;
	const page = listUnits(db, { ...rest, held: held === undefined ? undefined : held === 'yes' });
	return {
		page,
		filter,
		filterError: parsed.success ? null : (parsed.error.issues[0]?.message ?? 'Check the filter.'),
		states: UNIT_STATES,
		stages: STAGES
	};
};
