import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { travelersForLot } from '$lib/server/travelers';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, url }) => {
	const travelers = travelersForLot(getDb(), params.code);
	if (!travelers.length) error(404, { message: `No units in lot ${params.code} to print travelers for.` });
	return {
		code: params.code,
		travelers,
		layout: url.searchParams.get('layout') === 'sheet' ? ('sheet' as const) : ('label' as const),
		paper: url.searchParams.get('paper') === 'a4' ? ('a4' as const) : ('letter' as const)
	};
};
