/**
 * Response headers on the built server: the Content-Security-Policy from `kit.csp` (no inline
 * script but the ones it names by nonce or hash), nosniff, referrer policy, frame blocking,
 * and the cross-site checks on posts.
 */
import { createHash } from 'node:crypto';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { EXPECTED, type Fixtures } from '../access/matrix';
import { Client, cleanup, DEMO_PEOPLE, ensureBuilt, freshDemoDb, signedIn, startServer, type Reply, type RunningServer } from '../helpers/server';

const PORT = 4262;
let server: RunningServer;
let dir: string;
let owner: Client;
let anon: Client;
/** Codes read from the demo database: its lot codes carry the day it was seeded. */
let fixtures: Fixtures;

beforeAll(async () => {
	await ensureBuilt();
	const db = await freshDemoDb();
	dir = db.dir;
	const conn = new Database(db.file, { readonly: true });
	const one = (sql: string) => (conn.prepare(sql).get() as { code: string }).code;
	fixtures = {
		serial: one(`select serial as code from unit order by id limit 1`),
		stationCode: 'WASH',
		lotCode: one(`select code from core_lot order by id limit 1`),
		modelCode: one(`select code from turbo_model order by id limit 1`),
		// the owner's pages need no customer link
		token: 'not-a-valid-token-at-all',
		sharedPhotoId: 0
	};
	conn.close();
	server = await startServer(db.file, PORT);
	owner = await signedIn(server.origin, 'owner');
	anon = new Client(server.origin);
}, 240_000);

afterAll(async () => {
	owner?.close();
	anon?.close();
	await server?.stop();
	if (dir) cleanup(dir);
});

function directives(r: Reply): Map<string, string[]> {
	const csp = String(r.headers['content-security-policy'] ?? '');
	return new Map(
		csp
			.split(';')
			.map((d) => d.trim().split(/\s+/))
			.filter((d) => d[0])
			.map(([name, ...values]) => [name, values])
	);
}

function expectSafeHeaders(r: Reply, what: string) {
	expect(r.headers['x-content-type-options'], what).toBe('nosniff');
	expect(r.headers['referrer-policy'], what).toBe('same-origin');
	expect(r.headers['x-frame-options'], what).toBe('DENY');
}

/** Every inline script carries the response's nonce or is named by its hash; no inline handlers. */
function expectOnlyAllowedScripts(r: Reply, what: string) {
	const d = directives(r);
	const scriptSrc = d.get('script-src') ?? d.get('default-src') ?? [];
	expect(scriptSrc, what).not.toContain("'unsafe-inline'");
	expect(scriptSrc, what).not.toContain("'unsafe-eval'");
	expect(d.get('object-src'), what).toEqual(["'none'"]);
	expect(d.get('frame-ancestors'), what).toEqual(["'none'"]);
	expect(d.get('base-uri'), what).toEqual(["'self'"]);
	const nonces = scriptSrc.filter((s) => s.startsWith("'nonce-")).map((s) => s.slice(7, -1));
	const hashes = scriptSrc.filter((s) => s.startsWith("'sha256-")).map((s) => s.slice(8, -1));
	const scripts = [...r.text.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)].map(([, attrs, body]) => ({ attrs, body }));
	const external = scripts.filter((s) => /\bsrc=/.test(s.attrs));
	const inlined = scripts.filter((s) => !/\bsrc=/.test(s.attrs));
	expect(
		external.filter((s) => /src="(https?:)?\/\//.test(s.attrs)).map((s) => s.attrs),
		`${what}: external scripts come from our own origin`
	).toEqual([]);
	const allowed = (s: { attrs: string; body: string }) => {
		const nonce = /\bnonce="([^"]+)"/.exec(s.attrs)?.[1];
		return nonce ? nonces.includes(nonce) : hashes.includes(createHash('sha256').update(s.body).digest('base64'));
	};
	expect(inlined.filter((s) => !allowed(s)).map((s) => s.attrs), `${what}: inline script allowed by the policy`).toEqual([]);
	const inline = inlined.length;
	expect(r.text, `${what}: no inline event handlers`).not.toMatch(/<[^>]+\son[a-z]+\s*=/i);
	expect(r.text, `${what}: no javascript: URLs`).not.toMatch(/javascript:/i);
	return inline;
}

describe('headers on real responses', () => {
	test('every page the owner can open: CSP with a fresh nonce, nosniff, referrer policy, no framing', async () => {
		const f = fixtures;
		const pages = Object.entries(EXPECTED)
			.filter(([id, e]) => !id.startsWith('/api/') && e.checks.some((c) => c.method === 'GET' && c.answers.owner === 'ok'))
			.map(([, e]) => e.path(f, 'owner'));
		expect(pages.length).toBeGreaterThanOrEqual(6);
		const answers: [string, Reply][] = [];
		for (const p of pages) answers.push([p, await owner.get(p)]);
		expect(answers.map(([p, r]) => [p, r.status])).toEqual(pages.map((p) => [p, 200]));
		const isPage = (r: Reply) => String(r.headers['content-type'] ?? '').includes('text/html');
		// downloads (CSV, PDF) are not pages: no CSP to carry, but never sniffed
		const downloads = answers.filter(([, r]) => !isPage(r));
		expect(downloads.map(([p, r]) => [p, r.headers['x-content-type-options']])).toEqual(downloads.map(([p]) => [p, 'nosniff']));
		let inline = 0;
		let html = 0;
		for (const [p, r] of answers.filter(([, a]) => isPage(a))) {
			html += 1;
			expectSafeHeaders(r, p);
			inline += expectOnlyAllowedScripts(r, p);
		}
		expect(html).toBeGreaterThanOrEqual(6);
		expect(inline, 'the hydration scripts were seen and checked').toBeGreaterThanOrEqual(html);
		const a = directives(await owner.get('/stations')).get('script-src')!;
		const b = directives(await owner.get('/stations')).get('script-src')!;
		expect(a.find((s) => s.startsWith("'nonce-"))).not.toEqual(b.find((s) => s.startsWith("'nonce-")));
	});

	test('the sign-in page, error pages, redirects and the API carry the same headers', async () => {
		const login = await anon.get('/login');
		expectSafeHeaders(login, '/login');
		expectOnlyAllowedScripts(login, '/login');
		const missing = await owner.get('/units/SY-99999');
		expect(missing.status).toBe(404);
		expectSafeHeaders(missing, '404 page');
		expectOnlyAllowedScripts(missing, '404 page');
		const forbidden = await (await signedIn(server.origin, 'tech')).get('/admin/users');
		expect(forbidden.status).toBe(403);
		expectSafeHeaders(forbidden, '403 page');
		// a redirect from the access check is sent by the framework with the cookies set so far (no body to protect)
		const stale = new Client(server.origin);
		stale.cookies.set('sy_session', 'no-such-session-id-000000000000');
		const redirect = await stale.get('/units');
		expect(redirect.status).toBe(303);
		expect(redirect.headers.location).toBe('/login?next=%2Funits');
		expect(String(redirect.headers['set-cookie'])).toMatch(/sy_session=;.*Max-Age=0/i);
		stale.close();
		const api = await owner.get('/api/stations');
		expect(api.headers['content-type']).toMatch(/^application\/json/);
		expectSafeHeaders(api, 'api');
		expectSafeHeaders(await anon.get('/api/units'), 'api 401');
	});

	test('static files served before the hooks carry them too: built assets, fonts, the icon, a missing file', async () => {
		const login = await anon.get('/login');
		// the page links them relative to itself (./_app/…)
		const assets = [...new Set([...login.text.matchAll(/["'](?:\.\/|\/)?(_app\/immutable\/[^"']+\.(?:js|css))["']/g)].map((m) => `/${m[1]}`))];
		expect(assets.length, 'the sign-in page links built scripts and styles').toBeGreaterThanOrEqual(2);
		const css = assets.find((a) => a.endsWith('.css'));
		const fontRef = css ? /url\(["']?([^)"']+\.woff2)["']?\)/.exec((await anon.get(css)).text)?.[1] : undefined;
		const font = fontRef ? new URL(fontRef, `${server.origin}${css}`).pathname : undefined;
		expect(font, 'the stylesheet ships its own font files').toMatch(/^\/_app\/immutable\/assets\/[^/]+\.woff2$/);
		for (const path of [...assets.slice(0, 4), font!, '/favicon.svg']) {
			const r = await anon.get(path);
			expect(r.status, path).toBe(200);
			expectSafeHeaders(r, path);
		}
		const gone = await anon.get('/_app/immutable/chunks/no-such-file.js');
		expect(gone.status).toBe(404);
		expectSafeHeaders(gone, 'missing asset');
	});

	test('session cookies are HttpOnly and SameSite=Lax', async () => {
		const c = new Client(server.origin);
		const r = await c.postForm('/login', DEMO_PEOPLE.lead);
		const set = ([] as string[]).concat(r.headers['set-cookie'] ?? []).find((s) => s.startsWith('sy_session='))!;
		expect(set).toMatch(/HttpOnly/i);
		expect(set).toMatch(/SameSite=Lax/i);
		expect(set).toMatch(/Path=\//i);
		c.close();
	});
});

describe('cross-site posts are refused', () => {
	test('a form post from another site, or with no Origin at all, is refused by the framework', async () => {
		for (const origin of ['http://evil.example', 'null', undefined]) {
			const headers: Record<string, string> = { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' };
			if (origin) headers.origin = origin;
			const r = await owner.request('POST', '/admin/users?/create', {
				headers,
				body: new URLSearchParams({ name: 'Mallory Intruder', email: 'mallory@evil.example', role: 'owner', password: 'long enough pw 1' }).toString()
			});
			expect(r.status, String(origin)).toBe(403);
			expect(r.text).toContain('Cross-site POST form submissions are forbidden');
		}
		// the same post from our own origin is accepted, so the refusal above is the origin check
		const ok = await owner.action('/admin/users?/create', { name: 'Wren Halloway', email: 'wren@corvidhill.example', role: 'tech', password: 'long enough pw 1' });
		expect(ok.json().type).toBe('success');
	});

	test('a text/plain body (what a cross-site form can send) to the API is refused too', async () => {
		const tech = await signedIn(server.origin, 'tech');
		const r = await tech.request('POST', '/api/units/SY-00001/events', {
			headers: { 'content-type': 'text/plain', origin: 'http://evil.example' },
			body: JSON.stringify({ action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: 'cross-site-1' })
		});
		expect(r.status).toBe(403);
		const json = await tech.request('POST', '/api/units/SY-00001/events', {
			headers: { 'content-type': 'application/json', origin: 'http://evil.example' },
			body: JSON.stringify({ action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: 'cross-site-2' })
		});
		expect(json.status).toBe(403);
		expect(json.json().error.code).toBe('cross_site');
		tech.close();
	});
});
