/** Accounts: the owner creates people, changes their role and deactivates them. */
import { asc, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { ROLES, type Role } from '../domain/auth/roles';
import { hashPassword } from './auth';
import type { Db, DbOrTx } from './db';
import { session, user } from './db/schema';

export const newUserSchema = z.object({
	name: z.string().trim().min(2, 'Give the person’s name.').max(80, 'Keep the name under 80 characters.'),
	email: z.string().trim().toLowerCase().pipe(z.email('Give a valid e-mail address.')),
	role: z.enum(ROLES, { error: 'Choose a role.' }),
	password: z.string().min(10, 'Use at least 10 characters.').max(200, 'Keep the password under 200 characters.')
});
export type NewUser = z.infer<typeof newUserSchema>;

export interface UserView {
	id: string;
	name: string;
	email: string;
	role: Role;
	active: boolean;
}

export function listUsers(db: DbOrTx): UserView[] {
	return db
		.select({ id: user.id, name: user.name, email: user.email, role: user.role, active: user.active })
		.from(user)
		.orderBy(asc(user.name))
		.all();
}

export class DuplicateEmailError extends Error {}

export async function createUser(db: Db, input: NewUser): Promise<UserView> {
	const data = newUserSchema.parse(input);
	const passwordHash = await hashPassword(data.password);
	const id = randomUUID();
	return db.transaction((tx) => {
		const existing = tx.select({ id: user.id }).from(user).where(eq(user.email, data.email)).get();
		if (existing) throw new DuplicateEmailError(`${data.email} already has an account.`);
		tx.insert(user).values({ id, name: data.name, email: data.email, role: data.role, passwordHash }).run();
		return { id, name: data.name, email: data.email, role: data.role, active: true };
	});
}

/** Change a role; the person's sessions end so the new role applies at once. */
export function setRole(db: Db, userId: string, role: Role): boolean {
	return db.transaction((tx) => {
		const r = tx.update(user).set({ role }).where(eq(user.id, userId)).run();
		tx.delete(session).where(eq(session.userId, userId)).run();
		return r.changes === 1;
	});
}

/** Deactivate or reactivate; deactivating ends every session of that person. */
export function setActive(db: Db, userId: string, active: boolean): boolean {
	return db.transaction((tx) => {
		const r = tx.update(user).set({ active }).where(eq(user.id, userId)).run();
		if (!active) tx.delete(session).where(eq(session.userId, userId)).run();
		return r.changes === 1;
	});
}
