import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { isRole } from '$lib/domain/auth/roles';
import { getDb } from '$lib/server/db';
import { DuplicateEmailError, createUser, listUsers, newUserSchema, setActive, setRole } from '$lib/server/users';
import { LockLiftError, currentLocks, liftLock, recentLifts } from '$lib/server/sign-in-throttle';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	return { users: listUsers(db), locks: currentLocks(db), lifts: recentLifts(db), form: await superValidate(zod4(newUserSchema)) };
};

function str(form: FormData, name: string): string {
	const v = form.get(name);
	return typeof v === 'string' ? v : '';
}

export const actions: Actions = {
	create: async ({ request }) => {
		const form = await superValidate(request, zod4(newUserSchema));
		if (!form.valid) return fail(400, { form });
		try {
			const created = await createUser(getDb(), form.data);
			form.data.password = '';
			return message(form, `${created.name} can now sign in as ${created.role}.`);
		} catch (e) {
			if (e instanceof DuplicateEmailError) return setError(form, 'email', e.message);
			throw e;
		}
	},
	role: async ({ request, locals }) => {
		const form = await request.formData();
		const id = str(form, 'id');
		const role = str(form, 'role');
		if (!isRole(role)) return fail(400, { error: 'Choose a role.' });
		if (id === locals.user!.id && role !== 'owner') return fail(400, { error: 'You cannot take the owner role from yourself.' });
		if (!setRole(getDb(), id, role)) return fail(404, { error: 'No such person.' });
		return { done: 'Role changed; their sessions were ended.' };
	},
	active: async ({ request, locals }) => {
		const form = await request.formData();
		const id = str(form, 'id');
		const active = str(form, 'active') === 'true';
		if (id === locals.user!.id && !active) return fail(400, { error: 'You cannot deactivate yourself.' });
		if (!setActive(getDb(), id, active)) return fail(404, { error: 'No such person.' });
		return { done: active ? 'Reactivated.' : 'Deactivated; their sessions ended at once.' };
	},
	lift: async ({ request, locals }) => {
		const key = str(await request.formData(), 'key').slice(0, 400);
		if (!key) return fail(400, { error: 'Choose the lock to lift.' });
		try {
			const lifted = liftLock(getDb(), key, locals.user!.id);
			return { done: `Lifted: ${lifted.label.charAt(0).toLowerCase()}${lifted.label.slice(1)} may be tried again.` };
		} catch (e) {
			if (e instanceof LockLiftError) return fail(400, { error: e.message });
			throw e;
		}
	}
};
