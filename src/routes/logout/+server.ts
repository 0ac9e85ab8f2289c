import { redirect } from '@sveltejs/kit';
import { appAuth } from '$lib/server/app-auth';
import type { RequestHandler } from './$types';

/** Sign out this browser; with `everywhere=1`, end every session of the signed-in person. */
export const POST: RequestHandler = async ({ locals, cookies, request }) => {
	const auth = appAuth();
	let everywhere = false;
	const type = request.headers.get('content-type') ?? '';
	if (/application\/x-www-form-urlencoded|multipart\/form-data/i.test(type)) {
		try {
			everywhere = (await request.formData()).get('everywhere') === '1';
		} catch {
			everywhere = false;
		}
	}
	if (locals.user && everywhere) await auth.invalidateUser(locals.user.id);
	else if (locals.session) await auth.invalidate(locals.session.id);
	const blank = auth.blankCookie();
	cookies.set(blank.name, blank.value, blank.attributes);
	redirect(303, '/login');
};
