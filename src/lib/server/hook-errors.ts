/**
 * An error thrown by a hook (the access check) skips everything `resolve` would add, including
 * the security headers. This turns it into the response the framework would send (the static
 * error page, or JSON when asked for), so that the headers can be set on it. Redirects are left
 * to the framework, which adds the cookies set so far (a cleared session cookie) to them.
 */
import { isHttpError } from '@sveltejs/kit';
import errorTemplate from '../../error.html?raw';

const ESCAPE: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };
const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ESCAPE[c]);

function wantsJson(request: Request): boolean {
	const accept = request.headers.get('accept') ?? 'text/html';
	const json = accept.indexOf('application/json');
	const html = accept.indexOf('text/html');
	return json >= 0 && (html < 0 || json < html);
}

/** The response for a thrown HTTP error; anything else (redirects included) is rethrown. */
export function responseForThrown(e: unknown, request: Request): Response {
	if (isHttpError(e)) {
		const body = { message: 'Unknown Error', ...(e.body as object) } as { message: string };
		if (wantsJson(request)) return Response.json(body, { status: e.status });
		const html = errorTemplate
			.replaceAll('%sveltekit.status%', String(e.status))
			.replaceAll('%sveltekit.error.message%', escapeHtml(body.message));
		return new Response(html, { status: e.status, headers: { 'content-type': 'text/html; charset=utf-8' } });
	}
	throw e;
}
