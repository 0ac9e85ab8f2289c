/**
 * Sign-in: sessions and password hashing. The session library is deprecated upstream,
 * so it is used here and nowhere else; the rest of the app sees only these functions.
 */
import { DrizzleSQLiteAdapter } from '@lucia-auth/adapter-drizzle';
import { hash, verify } from '@node-rs/argon2';
import { eq, sql } from 'drizzle-orm';
import { Lucia, type DatabaseSession, type DatabaseUser } from 'lucia';
import type { Role } from '../domain/auth/roles';
import type { Db } from './db';
import { prepared } from './db/prepared';
import { session, user } from './db/schema';

/**
 * argon2id with the OWASP Password Storage Cheat Sheet's first listed setting:
 * m = 19 MiB (19456 KiB), t = 2, p = 1. The library's default algorithm is argon2id.
 */
export const ARGON2_OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
	return hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}

export interface SessionUser {
	id: string;
	email: string;
	name: string;
	role: Role;
	active: boolean;
}

export interface SessionInfo {
	id: string;
	userId: string;
	expiresAt: Date;
	fresh: boolean;
}

export interface SessionCookie {
	name: string;
	value: string;
	attributes: { path: string; httpOnly: boolean; sameSite: 'lax'; secure: boolean; maxAge?: number };
}

declare module 'lucia' {
	interface Register {
		Lucia: ReturnType<typeof makeLucia>;
		DatabaseUserAttributes: { email: string; name: string; role: Role; active: boolean };
	}
}

/**
 * The library's adapter, with the one lookup every request makes (session and its user) as a
 * single prepared join instead of two queries built afresh each time.
 */
class SessionAdapter extends DrizzleSQLiteAdapter {
	constructor(private readonly conn: Db) {
		super(conn, session, user);
	}

	override async getSessionAndUser(sessionId: string): Promise<[session: DatabaseSession | null, user: DatabaseUser | null]> {
		const row = prepared(this.conn, 'auth.sessionAndUser', (d) =>
			d
				.select({
					sessionId: session.id,
					userId: session.userId,
					expiresAt: session.expiresAt,
					email: user.email,
					name: user.name,
					role: user.role,
					active: user.active
				})
				.from(session)
				.innerJoin(user, eq(user.id, session.userId))
				.where(eq(session.id, sql.placeholder('id')))
				.prepare()
		).get({ id: sessionId });
		if (!row) return [null, null];
		return [
			{ id: row.sessionId, userId: row.userId, expiresAt: new Date(row.expiresAt * 1000), attributes: {} },
			{ id: row.userId, attributes: { email: row.email, name: row.name, role: row.role, active: row.active } }
		];
	}
}

function makeLucia(db: Db, secure: boolean) {
	const adapter = new SessionAdapter(db);
	return new Lucia(adapter, {
		sessionCookie: { name: 'sy_session', attributes: { secure, sameSite: 'lax' } },
		getUserAttributes: (attributes) => ({
			email: attributes.email,
			name: attributes.name,
			role: attributes.role,
			active: Boolean(attributes.active)
		})
	});
}

function cookieOf(c: { name: string; value: string; attributes: { secure?: boolean; maxAge?: number } }): SessionCookie {
	return {
		name: c.name,
		value: c.value,
		attributes: {
			path: '/',
			httpOnly: true,
			sameSite: 'lax',
			secure: Boolean(c.attributes.secure),
			maxAge: typeof c.attributes.maxAge === 'number' ? c.attributes.maxAge : undefined
		}
	};
}

export interface Auth {
	cookieName: string;
	createSession(userId: string): Promise<{ session: SessionInfo; cookie: SessionCookie }>;
	validate(sessionId: string): Promise<{ user: SessionUser; session: SessionInfo; cookie: SessionCookie | null } | null>;
	invalidate(sessionId: string): Promise<void>;
	invalidateUser(userId: string): Promise<void>;
	blankCookie(): SessionCookie;
	/** Check an email and password; null when either is wrong or the account is inactive. */
	signIn(email: string, password: string): Promise<SessionUser | null>;
}

/** A hash of nothing, so that an unknown email costs as much time as a wrong password. */
let dummyHash: Promise<string> | undefined;

export function createAuth(db: Db, options: { secure: boolean }): Auth {
	const lucia = makeLucia(db, options.secure);
	return {
		cookieName: lucia.sessionCookieName,
		async createSession(userId) {
			const s = await lucia.createSession(userId, {});
			return { session: s, cookie: cookieOf(lucia.createSessionCookie(s.id)) };
		},
		async validate(sessionId) {
			const { session: s, user: u } = await lucia.validateSession(sessionId);
			if (!s || !u) return null;
			if (!u.active) {
				await lucia.invalidateUserSessions(u.id);
				return null;
			}
			return {
				user: { id: u.id, email: u.email, name: u.name, role: u.role, active: u.active },
				session: s,
				cookie: s.fresh ? cookieOf(lucia.createSessionCookie(s.id)) : null
			};
		},
		invalidate: (id) => lucia.invalidateSession(id),
		invalidateUser: (userId) => lucia.invalidateUserSessions(userId),
		blankCookie: () => cookieOf(lucia.createBlankSessionCookie()),
		async signIn(email, password) {
			const row = db.select().from(user).where(eq(user.email, email.trim().toLowerCase())).get();
			if (!row) {
				dummyHash ??= hashPassword('no such account');
				await verifyPassword(await dummyHash, password);
				return null;
			}
			const ok = await verifyPassword(row.passwordHash, password);
			if (!ok || !row.active) return null;
			return { id: row.id, email: row.email, name: row.name, role: row.role, active: row.active };
		}
	};
}
