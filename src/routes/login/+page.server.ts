import { fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { homeFor } from '$lib/server/access';
import { appAuth } from '$lib/server/app-auth';
import { getDb } from '$lib/server/db';
import { recordSignInFailure, recordSignInSuccess, signInLocked } from '$lib/server/sign-in-throttle';
import { lockMessage } from '$lib/domain/auth/lockout';
import { signInSchema } from '$lib/schemas';
import { safeNext } from '$lib/server/safe-next';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next'), url.origin) ?? homeFor(locals.user.role));
	return { form: await superValidate(zod4(signInSchema)) };
};

export const actions: Actions = {
	default: async ({ request, cookies, url, locals, getClientAddress }) => {
		const form = await superValidate(request, zod4(signInSchema));
		if (!form.valid) return fail(400, { form });
		const auth = appAuth();
		const db = getDb();
		const keys = { email: form.data.email, address: getClientAddress() };
		// Locked keys are refused before the password is even hashed.
		const wait = signInLocked(db, keys);
		if (wait !== null) {
			form.data.password = '';
			return message(form, lockMessage(wait), { status: 429 });
		}
		const found = await auth.signIn(form.data.email, form.data.password);
		if (!found) {
			recordSignInFailure(db, keys);
			form.data.password = '';
			return message(form, 'That e-mail and password do not match an active account.', { status: 400 });
		}
		recordSignInSuccess(db, keys);
		// A new session on every sign-in; any session this browser had is ended.
		if (locals.session) await auth.invalidate(locals.session.id);
		const { cookie } = await auth.createSession(found.id);
		cookies.set(cookie.name, cookie.value, cookie.attributes);
		redirect(303, safeNext(url.searchParams.get('next'), url.origin) ?? homeFor(found.role));
	}
};
