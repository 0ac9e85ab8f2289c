import { error, json, redirect, type Handle } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { checkAccess } from '$lib/server/access';
import { appAuth } from '$lib/server/app-auth';
import { getDb } from '$lib/server/db';
import { startCustomerServices } from '$lib/server/customer-services';
import { sameOrigin } from '$lib/server/same-origin';
import { safeNext } from '$lib/server/safe-next';
import { responseForThrown } from '$lib/server/hook-errors';
import { formBodies } from '$lib/server/form-guard';

/** Open the database (and run migrations) before the first request. */
export const init = async () => {
	getDb();
	if (!building) await startCustomerServices(getDb());
};

const authenticate: Handle = async ({ event, resolve }) => {
	const auth = appAuth();
	const sessionId = event.cookies.get(auth.cookieName);
	event.locals.user = null;
	event.locals.session = null;
	if (sessionId) {
		const found = await auth.validate(sessionId);
		if (found) {
			event.locals.user = found.user;
			event.locals.session = found.session;
			if (found.cookie) event.cookies.set(found.cookie.name, found.cookie.value, found.cookie.attributes);
		} else {
			const blank = auth.blankCookie();
			event.cookies.set(blank.name, blank.value, blank.attributes);
		}
	}
	return resolve(event);
};

const authorize: Handle = async ({ event, resolve }) => {
	const routeId = event.route.id;
	if (!routeId) return resolve(event); // no such route: the framework answers 404
	const isApi = routeId.startsWith('/api/');
	const verdict = checkAccess(routeId, event.request.method, event.locals.user?.role ?? null);
	if (verdict === 'allow') return resolve(event);
	if (verdict === 'sign-in') {
		if (isApi) return json({ error: { code: 'unauthenticated', message: 'Sign in first.' } }, { status: 401 });
		if (event.request.method !== 'GET') error(401, { message: 'Sign in first.' });
		const next = safeNext(event.url.pathname + event.url.search, event.url.origin);
		redirect(303, next ? `/login?next=${encodeURIComponent(next)}` : '/login');
	}
	const message =
		verdict === 'unlisted'
			? 'This page has no access rule yet, so nobody may open it.'
			: `Your role (${event.locals.user?.role}) may not ${event.request.method === 'GET' ? 'open this page' : 'do this here'}.`;
	if (isApi) return json({ error: { code: 'forbidden', message } }, { status: 403 });
	error(403, { message, code: 'forbidden' });
};

const secureHeaders: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (e) {
		response = responseForThrown(e, event.request); // the access check's refusals get the headers too
	}
	response.headers.set('X-Content-Type-Options', 'nosniff');
	response.headers.set('Referrer-Policy', 'same-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	return response;
};

/** Floor screens are dark; office screens light. A `sy_theme` cookie overrides either. */
const theme: Handle = async ({ event, resolve }) => {
	const chosen = event.cookies.get('sy_theme');
	const floor = event.route.id?.startsWith('/(app)/stations') || /\/(balance|assembly)$/.test(event.route.id ?? '') || event.locals.user?.role === 'tech';
	const dark = chosen === 'dark' || (chosen !== 'light' && floor);
	return resolve(event, {
		transformPageChunk: ({ html }) => html.replace('%spoolyard.theme%', dark ? 'dark' : '')
	});
};

export const handle = sequence(secureHeaders, sameOrigin, authenticate, authorize, formBodies, theme);
