import { redirect } from '@sveltejs/kit';
import { appAuth } from '$lib/server/app-auth';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, cookies }) => {
	const auth = appAuth();
	if (locals.session) await auth.invalidate(locals.session.id);
	const blank = auth.blankCookie();
	cookies.set(blank.name, blank.value, blank.attributes);
	redirect(303, '/login');
};
