import { expect, test } from 'vitest';
import { createAuth } from '../../src/lib/server/auth';
import { openDatabase } from '../../src/lib/server/db/index';
import { createUser, setActive, setRole } from '../../src/lib/server/users';

test('sign in with argon2id, sessions validate, deactivation ends them at once', async () => {
	const db = openDatabase(':memory:');
	const auth = createAuth(db, { secure: true });
	const person = await createUser(db, { name: 'Test Tech', email: 'Tech@Shop.test', role: 'tech', password: 'correct horse battery' });
	expect(person.email).toBe('tech@shop.test');
	const row = db.$client.prepare('select password_hash from user where id = ?').get(person.id) as { password_hash: string };
	// OWASP Password Storage Cheat Sheet: argon2id, m=19456 KiB, t=2, p=1
	expect(row.password_hash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);

	expect(await auth.signIn('tech@shop.test', 'wrong password')).toBeNull();
	expect(await auth.signIn('nobody@shop.test', 'correct horse battery')).toBeNull();
	const signedIn = await auth.signIn(' TECH@shop.test ', 'correct horse battery');
	expect(signedIn).toMatchObject({ id: person.id, role: 'tech' });

	const { session, cookie } = await auth.createSession(person.id);
	expect(cookie).toMatchObject({ name: 'sy_session', attributes: { httpOnly: true, sameSite: 'lax', secure: true } });
	expect((await auth.validate(session.id))?.user.role).toBe('tech');

	setRole(db, person.id, 'lead');
	expect(await auth.validate(session.id)).toBeNull();

	const again = await auth.createSession(person.id);
	expect((await auth.validate(again.session.id))?.user.role).toBe('lead');
	setActive(db, person.id, false);
	expect(await auth.validate(again.session.id)).toBeNull();
	expect(await auth.signIn('tech@shop.test', 'correct horse battery')).toBeNull();
});

test('a duplicate e-mail is refused', async () => {
	const db = openDatabase(':memory:');
	await createUser(db, { name: 'First', email: 'a@shop.test', role: 'office', password: 'long enough pw' });
	await expect(createUser(db, { name: 'Second', email: 'A@shop.test', role: 'tech', password: 'long enough pw' })).rejects.toThrow(/already/);
});
