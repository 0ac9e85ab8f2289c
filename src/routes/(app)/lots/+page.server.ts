import { INTAKE_ROLES } from '$lib/domain/auth/roles';
import { getDb } from '$lib/server/db';
import { fieldsFor } from '$lib/server/access';
import { isLotSortKey, listLots, lotView } from '$lib/server/lots';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, locals }) => {
	const role = locals.user!.role;
	const s = url.searchParams.get('sort');
	const sort = isLotSortKey(s, role) ? s : 'receivedOn';
	const dir = url.searchParams.get('dir') === 'asc' ? 'asc' : 'desc';
	return { lots: listLots(getDb(), sort, dir).map((l) => lotView(l, role)), sort, dir, fields: fieldsFor(role), canCreate: INTAKE_ROLES.includes(role) } as const;
};
