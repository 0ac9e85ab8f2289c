/**
 * Redirect targets chosen by the client: same-origin paths only. Each hostile target is also
 * resolved with the WHATWG URL parser (Node's `URL`, the same algorithm browsers use for a
 * `Location` header) where that shows why it is refused: it would land on another host.
 */
import { describe, expect, test } from 'vitest';
import { safeNext } from '../../src/lib/server/safe-next';

const ORIGIN = 'http://127.0.0.1:3000';

describe('safeNext', () => {
	test.each([
		['/', '/'],
		['/stations/WASH', '/stations/WASH'],
		['/units?q=SY-00421&state=received', '/units?q=SY-00421&state=received'],
		['/reports/scrap?supplier=Pellmarsh%20Cores#lots', '/reports/scrap?supplier=Pellmarsh%20Cores#lots'],
		// a slash encoded in the query is a value, not a path separator
		['/units?q=a%2Fb', '/units?q=a%2Fb'],
		// dot segments are resolved the way the browser would
		['/lots/../units', '/units'],
		// a literal percent sign in a name
		['/lots/100%25', '/lots/100%25']
	])('%s is a path on our origin → %s', (next, expected) => {
		expect(safeNext(next, ORIGIN)).toBe(expected);
		expect(new URL(expected, ORIGIN).origin).toBe(ORIGIN);
	});

	test.each([
		// what browsers open as another site (WHATWG URL: a backslash is a slash in http(s) URLs)
		['/\\evil.example/phish', 'evil.example'],
		['/\\/evil.example', 'evil.example'],
		['\\\\evil.example', 'evil.example'],
		['//evil.example', 'evil.example'],
		['//evil.example/%2e%2e', 'evil.example'],
		['///evil.example', 'evil.example'],
		// a tab or line break is dropped by the parser, leaving `//`
		['/\t/evil.example', 'evil.example'],
		['/\n/evil.example', 'evil.example'],
		['/\r\n/evil.example', 'evil.example'],
		// dot segments that fold into `//`
		['/.//evil.example', null],
		['/..//evil.example', null],
		// schemes
		['http://evil.example/', 'evil.example'],
		['https:evil.example', null],
		['javascript:alert(1)', null],
		['data:text/html,hi', null],
		['HTTP://evil.example', 'evil.example'],
		// encoded slashes and backslashes in the path, once or twice
		['/%2fevil.example', null],
		['/%2Fevil.example', null],
		['/%5cevil.example', null],
		['/%5Cevil.example/phish', null],
		['/%252f%252fevil.example', null],
		['/%255cevil.example', null],
		// encoded control characters
		['/%09/evil.example', null],
		['/%0a/evil.example', null],
		['/%00', null],
		// raw controls, spaces, non-ASCII (look-alike slashes)
		['/\u0000', null],
		['/ /evil.example', null],
		['/\u2215\u2215evil.example', null],
		['/\uff0f\uff0fevil.example', null],
		// relative and empty
		['evil.example', null],
		['', null],
		// broken percent-encoding
		['/%E0%A4%A', null],
		// absurdly long
		['/' + 'a'.repeat(3000), null]
	])('%j is refused', (next, hostIfFollowed) => {
		expect(safeNext(next, ORIGIN)).toBeNull();
		if (hostIfFollowed !== null) expect(new URL(next, ORIGIN).host).toBe(hostIfFollowed);
	});

	test('missing targets give null, and the origin given decides what is ours', () => {
		expect(safeNext(null, ORIGIN)).toBeNull();
		expect(safeNext(undefined, ORIGIN)).toBeNull();
		expect(safeNext('/units', 'https://shop.example')).toBe('/units');
		expect(safeNext('/units', 'not an origin')).toBeNull();
	});
});
