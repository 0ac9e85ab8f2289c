import { INTAKE_ROLES } from '$lib/domain/auth/roles';
import { getDb } from '$lib/server/db';
import { isLotSortKey, listLots } from '$lib/server/lots';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, locals }) => {
	const s = url.searchParams.get('sort');
	const sort = isLotSortKey(s) ? s : 'receivedOn';
	const dir = url.searchParams.get('dir') === 'asc' ? 'asc' : 'desc';
	return { lots: listLots(getDb(), sort, dir), sort, dir, canCreate: INTAKE_ROLES.includes(locals.user!.role) } as const;
};
