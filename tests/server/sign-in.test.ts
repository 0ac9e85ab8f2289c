/**
 * Sign-in over HTTP on the built server: lock-out per account and per address (surviving a
 * restart), a new session on every sign-in, sessions ended by a role change, by signing out
 * everywhere and by the owner's deactivation.
 */
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Client, cleanup, DEMO_PEOPLE, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const PORT = 4261;
let server: RunningServer;
let dir: string;
let file: string;
const clients: Client[] = [];

function client() {
	const c = new Client(server.origin);
	clients.push(c);
	return c;
}
async function as(who: keyof typeof DEMO_PEOPLE) {
	const c = await signedIn(server.origin, who);
	clients.push(c);
	return c;
}
function userId(email: string): string {
	const c = new Database(file, { readonly: true });
	const row = c.prepare('select id from user where email = ?').get(email) as { id: string };
	c.close();
	return row.id;
}
/** Whether this client's session still works on an API route. */
async function signedInStill(c: Client) {
	return (await c.get('/api/stations')).status === 200;
}
function tryPassword(c: Client, email: string, password: string) {
	return c.postForm('/login', { email, password });
}

beforeAll(async () => {
	await ensureBuilt();
	({ dir, file } = await freshDemoDb());
	server = await startServer(file, PORT);
}, 240_000);

afterAll(async () => {
	for (const c of clients) c.close();
	await server?.stop();
	if (dir) cleanup(dir);
});

describe('lock-out', () => {
	test('five wrong passwords lock the account, even against the right one, and the lock survives a restart', async () => {
		const c = client();
		const { email, password } = DEMO_PEOPLE.tech;
		for (let i = 0; i < 4; i++) {
			const r = await tryPassword(c, email, 'not the password');
			expect(r.status).toBe(400);
			expect(r.text).toContain('do not match an active account');
		}
		const fifth = await tryPassword(c, email, 'still not it');
		expect(fifth.status).toBe(400);
		const locked = await tryPassword(c, email, password);
		expect(locked.status).toBe(429);
		expect(locked.text).toContain('Too many failed sign-ins. Wait 15 minutes and try again');
		expect(c.cookies.has('sy_session')).toBe(false);
		// the same e-mail in other capitals is the same account
		expect((await tryPassword(c, email.toUpperCase(), password)).status).toBe(429);

		await server.stop();
		server = await startServer(file, PORT);
		const after = new Client(server.origin);
		clients.push(after);
		expect((await tryPassword(after, email, password)).status).toBe(429);
		// another person is not affected
		await after.signIn(DEMO_PEOPLE.tech2.email, DEMO_PEOPLE.tech2.password);
		expect(await signedInStill(after)).toBe(true);
	}, 60_000);

	test('the owner lifts the account lock from the people page: the person signs in at once, and the lift is kept', async () => {
		const owner = await as('owner');
		const { email, password } = DEMO_PEOPLE.tech;
		const page = await owner.get('/admin/users');
		expect(page.text).toContain(`Sign-ins as ${email}`);
		const r = await owner.action('/admin/users?/lift', { key: `account:${email}` });
		expect(r.json().type).toBe('success');
		const again = await owner.action('/admin/users?/lift', { key: `account:${email}` });
		expect(again.json().type).toBe('failure');
		expect(JSON.stringify(again.json())).toContain('already ended or been lifted');
		const c = client();
		await c.signIn(email, password);
		expect(await signedInStill(c)).toBe(true);
		const db = new Database(file, { readonly: true });
		const lifts = db.prepare(`select key, lifted_by as liftedBy from sign_in_lock_lift`).all();
		db.close();
		expect(lifts).toEqual([{ key: `account:${email}`, liftedBy: userId(DEMO_PEOPLE.owner.email) }]);
	}, 60_000);

	test('an unknown e-mail is locked the same way, so a lock says nothing about who has an account', async () => {
		const c = client();
		for (let i = 0; i < 5; i++) expect((await tryPassword(c, 'nobody@corvidhill.example', `guess ${i}`)).status).toBe(400);
		expect((await tryPassword(c, 'nobody@corvidhill.example', 'guess 6')).status).toBe(429);
	});
});

describe('sessions', () => {
	test('every sign-in gets a new session id and ends the one the browser had; a planted id is never adopted', async () => {
		const c = await as('lead');
		const first = c.cookies.get('sy_session')!;
		await c.signIn(DEMO_PEOPLE.lead.email, DEMO_PEOPLE.lead.password);
		const second = c.cookies.get('sy_session')!;
		expect(second).not.toBe(first);
		const old = client();
		old.cookies.set('sy_session', first);
		expect(await signedInStill(old)).toBe(false);

		const planted = client();
		planted.cookies.set('sy_session', 'aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa');
		await planted.signIn(DEMO_PEOPLE.lead.email, DEMO_PEOPLE.lead.password);
		expect(planted.cookies.get('sy_session')).not.toBe('aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa');
		expect(await signedInStill(planted)).toBe(true);
	});

	test('a role change ends the person’s sessions at once; signing in again gives the new role', async () => {
		const owner = await as('owner');
		const dana = await as('tech2');
		const id = userId(DEMO_PEOPLE.tech2.email);
		const r = await owner.action('/admin/users?/role', { id, role: 'office' });
		expect(r.status).toBe(200);
		expect(r.json().type).toBe('success');
		expect(await signedInStill(dana)).toBe(false);
		await dana.signIn(DEMO_PEOPLE.tech2.email, DEMO_PEOPLE.tech2.password);
		// office may not post moves
		const move = await dana.postJson('/api/units/SY-00001/events', { action: 'inspect', idempotencyKey: 'role-change-1' });
		expect(move.status).toBe(403);
		expect((await owner.action('/admin/users?/role', { id, role: 'tech' })).json().type).toBe('success');
		expect(await signedInStill(dana)).toBe(false);
	});

	test('sign out everywhere ends every session of that person, and only theirs', async () => {
		const laptop = await as('lead');
		const tablet = await as('lead');
		const other = await as('office');
		const r = await laptop.postForm('/logout', { everywhere: '1' });
		expect(r.status).toBe(303);
		expect(r.headers.location).toBe('/login');
		expect(await signedInStill(laptop)).toBe(false);
		expect(await signedInStill(tablet)).toBe(false);
		expect(await signedInStill(other)).toBe(true);
	});

	test('a plain sign out ends only this browser’s session', async () => {
		const laptop = await as('lead');
		const tablet = await as('lead');
		expect((await laptop.postForm('/logout', {})).status).toBe(303);
		expect(await signedInStill(laptop)).toBe(false);
		expect(await signedInStill(tablet)).toBe(true);
	});

	test('the owner deactivates someone: their open sessions end on the next request, and they cannot sign in', async () => {
		const owner = await as('owner');
		const priya = await as('office');
		const priya2 = await as('office');
		expect(await signedInStill(priya)).toBe(true);
		const id = userId(DEMO_PEOPLE.office.email);
		const r = await owner.action('/admin/users?/active', { id, active: 'false' });
		expect(r.json().type).toBe('success');
		expect(await signedInStill(priya)).toBe(false);
		expect((await priya2.get('/units')).status).toBe(303);
		const again = await tryPassword(client(), DEMO_PEOPLE.office.email, DEMO_PEOPLE.office.password);
		expect(again.status).toBe(400);
		// the owner cannot deactivate themselves
		const self = await owner.action('/admin/users?/active', { id: userId(DEMO_PEOPLE.owner.email), active: 'false' });
		expect(self.json()).toMatchObject({ type: 'failure', status: 400 });
		expect((await owner.action('/admin/users?/active', { id, active: 'true' })).json().type).toBe('success');
		await priya.signIn(DEMO_PEOPLE.office.email, DEMO_PEOPLE.office.password);
		expect(await signedInStill(priya)).toBe(true);
	});
});

describe('lock-out per address', () => {
	// last in this file: it locks 127.0.0.1 for everyone
	test('twenty failures from one address, on any accounts, lock that address; the owner can lift it', async () => {
		const ownerBefore = await as('owner');
		const c = client();
		const db = new Database(file, { readonly: true });
		const row = db.prepare(`select failures from sign_in_throttle where key = 'address:127.0.0.1'`).get() as { failures: number } | undefined;
		db.close();
		const before = row?.failures ?? 0; // earlier tests in this file failed from here too
		expect(before).toBeGreaterThan(0);
		for (let i = before; i < 20; i++) {
			expect((await tryPassword(c, `walker${i}@corvidhill.example`, 'wrong')).status, `failure ${i + 1}`).toBe(400);
		}
		const r = await tryPassword(c, DEMO_PEOPLE.lead.email, DEMO_PEOPLE.lead.password);
		expect(r.status).toBe(429);
		expect(r.text).toContain('Too many failed sign-ins');

		// the owner, still signed in, lifts it; the lead gets in again
		const lift = await ownerBefore.action('/admin/users?/lift', { key: 'address:127.0.0.1' });
		expect(lift.json().type).toBe('success');
		const lead = client();
		await lead.signIn(DEMO_PEOPLE.lead.email, DEMO_PEOPLE.lead.password);
		expect(await signedInStill(lead)).toBe(true);
	}, 60_000);
});
