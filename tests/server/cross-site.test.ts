/**
 * Requests another site can make a signed-in browser send, on the built server:
 * - redirects after sign-in go to our own paths only, whatever `next` says;
 * - every state-changing request (any content type, any route) from another origin is refused,
 *   and so is one with no Origin but a Referer from another site; the payment webhook, which is
 *   signed, is the one exception.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Client, cleanup, DEMO_PEOPLE, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const PORT = 4281;
const EVIL = 'http://evil.example';
let server: RunningServer;
let dir: string;
const clients: Client[] = [];

beforeAll(async () => {
	await ensureBuilt();
	const db = await freshDemoDb();
	dir = db.dir;
	server = await startServer(db.file, PORT);
}, 300_000);

afterAll(async () => {
	for (const c of clients) c.close();
	await server?.stop();
	if (dir) cleanup(dir);
});

async function as(who: keyof typeof DEMO_PEOPLE): Promise<Client> {
	const c = await signedIn(server.origin, who);
	clients.push(c);
	return c;
}

async function signedInStill(c: Client) {
	return (await c.get('/api/stations')).status === 200;
}

/** Where a browser would go for this Location header. */
function landsOn(location: string | undefined): URL {
	return new URL(String(location), server.origin);
}

const HOSTILE_NEXT = [
	'/%5Cevil.example/phish',
	'/%5cevil.example',
	'/%09/evil.example',
	'/%0A/evil.example',
	'//evil.example',
	'/.//evil.example',
	'/%2F%2Fevil.example',
	'/%255Cevil.example',
	'http://evil.example/',
	'javascript:alert(1)'
];

describe('sign-in redirects stay on our origin', () => {
	test('signed in, GET /login?next=<hostile> goes home; a path of ours is kept', async () => {
		const owner = await as('owner');
		const home = await owner.get('/login');
		expect(home.status).toBe(303);
		expect(home.headers.location).toBe('/');
		for (const next of HOSTILE_NEXT) {
			// the target as it arrives in the query string: encoded once more, as a link would carry it
			const r = await owner.get(`/login?next=${encodeURIComponent(decodeURIComponent(next))}`);
			expect(r.status, next).toBe(303);
			expect(r.headers.location, next).toBe('/');
			// and as typed into the address bar, not encoded again
			const raw = await owner.get(`/login?next=${next}`);
			expect(raw.status, next).toBe(303);
			expect(raw.headers.location, next).toBe('/');
			expect(landsOn(raw.headers.location).origin).toBe(server.origin);
		}
		const ok = await owner.get(`/login?next=${encodeURIComponent('/units?state=received')}`);
		expect(ok.headers.location).toBe('/units?state=received');
	});

	test('the sign-in POST with a hostile next goes to the home page of the role', async () => {
		for (const next of HOSTILE_NEXT) {
			const c = new Client(server.origin);
			clients.push(c);
			const r = await c.postForm(`/login?next=${next}`, { email: DEMO_PEOPLE.tech.email, password: DEMO_PEOPLE.tech.password });
			expect(r.status, next).toBe(303);
			expect(r.headers.location, next).toBe('/stations');
		}
		const c = new Client(server.origin);
		clients.push(c);
		const ok = await c.postForm(`/login?next=${encodeURIComponent('/stations/WASH')}`, { email: DEMO_PEOPLE.tech.email, password: DEMO_PEOPLE.tech.password });
		expect(ok.headers.location).toBe('/stations/WASH');
	});

	test('a page that needs a sign-in sends to /login with a next that the login page will follow', async () => {
		const anon = new Client(server.origin);
		clients.push(anon);
		const r = await anon.get('/units?state=received');
		expect(r.status).toBe(303);
		expect(r.headers.location).toBe(`/login?next=${encodeURIComponent('/units?state=received')}`);
	});
});

describe('state-changing requests from another site are refused, whatever the content type', () => {
	const BODIES: { type: string | null; body?: string }[] = [
		{ type: null },
		{ type: 'text/plain', body: 'everywhere=1' },
		{ type: 'application/json', body: '{"everywhere":"1"}' },
		{ type: 'application/x-www-form-urlencoded', body: 'everywhere=1' },
		{ type: 'multipart/form-data; boundary=x', body: '--x\r\nContent-Disposition: form-data; name="everywhere"\r\n\r\n1\r\n--x--\r\n' }
	];

	test('POST /logout from another Origin does not end the session, for every content type', async () => {
		const lead = await as('lead');
		for (const { type, body } of BODIES) {
			const headers: Record<string, string> = { origin: EVIL };
			if (type) headers['content-type'] = type;
			const r = await lead.request('POST', '/logout', { headers, body });
			expect(r.status, String(type)).toBe(403);
			expect(await signedInStill(lead), String(type)).toBe(true);
		}
		// `Origin: null` (a sandboxed frame, a data: page) is another origin too
		expect((await lead.request('POST', '/logout', { headers: { origin: 'null' } })).status).toBe(403);
		expect(await signedInStill(lead)).toBe(true);
	});

	test('no Origin but a Referer from another site is refused too', async () => {
		const lead = await as('lead');
		for (const { type, body } of BODIES) {
			const headers: Record<string, string> = { referer: `${EVIL}/page` };
			if (type) headers['content-type'] = type;
			const r = await lead.request('POST', '/logout', { headers, body });
			expect(r.status, String(type)).toBe(403);
			expect(await signedInStill(lead), String(type)).toBe(true);
		}
	});

	test('from our own origin, or with neither header (a program, not a page), sign-out works', async () => {
		const a = await as('lead');
		const own = await a.request('POST', '/logout', { headers: { origin: server.origin } });
		expect(own.status).toBe(303);
		expect(await signedInStill(a)).toBe(false);
		const b = await as('lead');
		const referer = await b.request('POST', '/logout', { headers: { referer: `${server.origin}/stations` } });
		expect(referer.status).toBe(303);
		expect(await signedInStill(b)).toBe(false);
		const c = await as('lead');
		const program = await c.request('POST', '/logout');
		expect(program.status).toBe(303);
		expect(await signedInStill(c)).toBe(false);
	});

	test('API calls and form actions from another origin are refused with every content type and method; nothing changes', async () => {
		const lead = await as('lead');
		const before = (await lead.get('/api/units/SY-00001')).json();
		for (const { type, body } of [...BODIES, { type: 'application/json', body: JSON.stringify({ action: 'hold', idempotencyKey: 'cross-site-hold', data: { reason: 'from elsewhere' } }) }]) {
			for (const method of ['POST', 'PUT', 'PATCH', 'DELETE']) {
				const headers: Record<string, string> = { origin: EVIL, accept: 'application/json' };
				if (type) headers['content-type'] = type;
				const api = await lead.request(method, '/api/units/SY-00001/events', { headers, body });
				expect(api.status, `${method} ${type}`).toBe(403);
				// the framework refuses the three types a plain HTML form can send before our check runs
				const framework = /^(text\/plain|application\/x-www-form-urlencoded|multipart\/form-data)/.test(type ?? '');
				expect(framework ? api.text : api.json().error.code, `${method} ${type}`).toMatch(framework ? new RegExp(`Cross-site ${method} form submissions are forbidden`) : /^cross_site$/);
			}
		}
		const owner = await as('owner');
		const json = await owner.request('POST', '/admin/users?/create', {
			headers: { origin: EVIL, 'content-type': 'application/json', accept: 'text/html' },
			body: JSON.stringify({ name: 'Mallory Intruder', email: 'mallory@evil.example', role: 'owner', password: 'long enough pw 1' })
		});
		expect(json.status).toBe(403);
		expect(json.text).toContain('Cross-site requests are refused');
		expect((await lead.get('/api/units/SY-00001')).json()).toEqual(before);
	});

	test('the payment webhook is the one exception: it is checked by its signature, not its origin', async () => {
		const r = await new Client(server.origin).request('POST', '/api/payments/webhook', {
			headers: { origin: EVIL, 'content-type': 'application/json', 'stripe-signature': 't=1,v1=00' },
			body: '{"id":"evt_x","type":"checkout.session.completed","data":{"object":{}}}'
		});
		expect(r.status).toBe(400);
		expect(r.json().error.code).toBe('bad_signature');
	});
});
