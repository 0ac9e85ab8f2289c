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
	if (!/^multipart\//i.test(type)) {
		// a typed form is small; a body past the limit would reach the action as an empty form with no word of why
		const length = Number(request.headers.get('content-length') ?? NaN);
		if (length > MAX_TYPED_FORM_BYTES) error(413, { message: TOO_LARGE });
		try {
			const text = await request.clone().text();
			if (new TextEncoder().encode(text).length > MAX_TYPED_FORM_BYTES) error(413, { message: TOO_LARGE });
		} catch (e) {
			if (e && typeof e === 'object' && 'status' in e) throw e;
			error(413, { message: TOO_LARGE });
		}
	}
	if (/^multipart\//i.test(type)) {
		try {
			await request.clone().formData();
		} catch {
			error(400, { message: 'The form could not be read; send it again.' });
		}
	}
	return resolve(event);
};

/** Typed (form-encoded) forms: no field of ours takes more than a few kilobytes. */
const MAX_TYPED_FORM_BYTES = 1024 * 1024;
const TOO_LARGE = 'The form is too large to read (at most 1 MB of typed text); shorten the longest field and send it again.';

/** Endpoints outside `/api/` that take posts and read their own bodies. */
const ENDPOINTS = new Set(['/logout']);
