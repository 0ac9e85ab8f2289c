/**
 * Every state-changing request (any method but GET, HEAD and OPTIONS), whatever its content
 * type and whatever the route, must come from our own origin. SvelteKit refuses cross-site
 * *form* posts by itself (urlencoded, multipart, text/plain); this check also covers a post
 * with no content type (a bare `fetch(url, { method: 'POST' })` from another site) or with a
 * JSON or any other body, on pages and API routes alike.
 *
 * - `Origin` present: it must equal the app's origin exactly (`null`, sent from sandboxed
 *   frames and opaque origins, is refused).
 * - `Origin` missing: browsers send `Origin` on every request that is not GET or HEAD, so a
 *   request without it was not sent by a page in a current browser. A `Referer` naming another
 *   origin is still refused (older browsers, or a proxy that strips `Origin`); with neither
 *   header the request comes from a program (a script, the tests, a provider's server), which
 *   holds no visitor's cookies, and passes.
 *
 * The one exception is the payment provider's webhook: it is called server to server and is
 * authenticated by its signature, not by a session.
 */
import { json, text, type Handle } from '@sveltejs/kit';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Routes that authenticate each request by its own signature and take no session. */
export const SIGNED_ROUTES: ReadonlySet<string> = new Set(['/api/payments/webhook']);

function originOf(address: string): string | null {
	try {
		return new URL(address).origin;
	} catch {
		return null;
	}
}

/** Why a request is refused as cross-site, or null when it may go on. */
export function crossSiteReason(method: string, headers: Headers, appOrigin: string, routeId: string | null): string | null {
	if (SAFE.has(method.toUpperCase())) return null;
	if (routeId !== null && SIGNED_ROUTES.has(routeId)) return null;
	const origin = headers.get('origin');
	if (origin !== null) return origin === appOrigin ? null : `Origin ${origin.slice(0, 100)}`;
	const referer = headers.get('referer');
	if (referer !== null && originOf(referer) !== appOrigin) return 'Referer from another site';
	return null;
}

export const sameOrigin: Handle = async ({ event, resolve }) => {
	const reason = crossSiteReason(event.request.method, event.request.headers, event.url.origin, event.route.id);
	if (reason === null) return resolve(event);
	const message = 'Cross-site requests are refused: send this from a Spoolyard page.';
	if (event.url.pathname.startsWith('/api/') || (event.request.headers.get('accept') ?? '').includes('application/json')) {
		return json({ error: { code: 'cross_site', message } }, { status: 403 });
	}
	return text(message, { status: 403, headers: { 'content-type': 'text/plain; charset=utf-8' } });
};
