/**
 * Redirect targets a client may choose (`?next=` after sign-in): only paths on our own origin.
 * A browser reads `/\evil.example`, `/%09/evil.example` (a tab it drops) and `//evil.example`
 * as addresses on another site, so the target is refused unless it is plain printable ASCII,
 * starts with one `/`, carries no backslash and no encoded slash or backslash in its path, and
 * still names our origin with a single leading `/` once the URL API has resolved it. Callers
 * fall back to the person's home page on `null`.
 */

const MAX_LENGTH = 2000;
/** Printable ASCII without the space and without the backslash. */
const PLAIN = /^[\x21-\x5b\x5d-\x7e]+$/;

/**
 * Percent-decode until nothing changes (at most a few rounds): what a server that decodes more
 * than once could make of the path. Null when the text itself is not valid percent-encoding.
 */
function decodeFully(text: string): string | null {
	let current = text;
	for (let i = 0; i < 4; i++) {
		let next: string;
		try {
			next = decodeURIComponent(current);
		} catch {
			return i === 0 ? null : current; // a literal `%` left after decoding (`%25` in a name)
		}
		if (next === current) return current;
		current = next;
	}
	return null; // still changing after four rounds: nobody writes a link like that
}

/**
 * The same-origin path, query and fragment `next` names, normalised by the URL API, or null
 * when `next` is missing or could take the browser anywhere but `origin`.
 */
export function safeNext(next: string | null | undefined, origin: string): string | null {
	if (typeof next !== 'string' || next.length === 0 || next.length > MAX_LENGTH) return null;
	if (!PLAIN.test(next)) return null; // backslashes, spaces, tabs, line breaks, other controls, non-ASCII
	if (next[0] !== '/' || next[1] === '/') return null; // schemes, relative paths, protocol-relative `//`
	const path = next.split(/[?#]/, 1)[0];
	const decoded = decodeFully(path);
	if (decoded === null) return null;
	// an encoded slash or backslash (%2f, %5c, or encoded twice) in the path, or an encoded control character
	if (decoded.split('/').length !== path.split('/').length || /[\\\x00-\x1f\x7f]/.test(decoded)) return null;
	let base: URL;
	let url: URL;
	try {
		base = new URL(origin);
		url = new URL(next, base);
	} catch {
		return null;
	}
	if (url.origin !== base.origin) return null;
	const target = url.pathname + url.search + url.hash;
	// dot segments can fold `/.//evil.example` into `//evil.example`: check what the URL API made of it
	if (!target.startsWith('/') || target.startsWith('//')) return null;
	return target;
}
