/**
 * Defence in depth for the JSON API: SvelteKit refuses cross-site *form* posts by itself; a
 * browser cannot send a cross-site JSON body without a CORS preflight we never grant, and our
 * cookies are SameSite=Lax. Still, a mutating API call that names another origin is refused here.
 */
import { json, type Handle } from '@sveltejs/kit';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export const sameOriginApi: Handle = async ({ event, resolve }) => {
	const origin = event.request.headers.get('origin');
	if (origin !== null && !SAFE.has(event.request.method) && event.url.pathname.startsWith('/api/') && origin !== event.url.origin) {
		return json({ error: { code: 'cross_site', message: 'Cross-site requests to the API are refused.' } }, { status: 403 });
	}
	return resolve(event);
};
