import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { travelerForUnit } from '$lib/server/travelers';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, url }) => {
	const t = travelerForUnit(getDb(), params.serial);
	if (!t) error(404, { message: `No unit ${params.serial} in the shop.` });
	return {
		traveler: t,
		layout: url.searchParams.get('layout') === 'sheet' ? ('sheet' as const) : ('label' as const),
		paper: url.searchParams.get('paper') === 'a4' ? ('a4' as const) : ('letter' as const)
	};
};
