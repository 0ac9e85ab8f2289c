/**
 * Form actions read their body with `request.formData()`, which throws on a body that is not a
 * form (wrong content type, a broken multipart body): that would be a 500. Every post to a page
 * is checked here first, so each action, present and future, gets a clear 4xx instead.
 */
import { error, type Handle } from '@sveltejs/kit';

const FORM = /^(application\/x-www-form-urlencoded|multipart\/form-data)\b/i;

export const formBodies: Handle = async ({ event, resolve }) => {
	const { request, route } = event;
	if (request.method !== 'POST' || !route.id || route.id.startsWith('/api/') || ENDPOINTS.has(route.id)) return resolve(event);
	const type = request.headers.get('content-type') ?? '';
	if (!FORM.test(type)) error(415, { message: 'Send the form as a web form (form-encoded or multipart).' });
	if (/^multipart\//i.test(type)) {
		try {
			await request.clone().formData();
		} catch {
			error(400, { message: 'The form could not be read; send it again.' });
		}
	}
	return resolve(event);
};

/** Endpoints outside `/api/` that take posts and read their own bodies. */
const ENDPOINTS = new Set(['/logout']);
