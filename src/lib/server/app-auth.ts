/** The application's sign-in service on its shared connection. */
import { dev } from '$app/environment';
import { createAuth, type Auth } from './auth';
import { getDb } from './db';

let auth: Auth | undefined;

export function appAuth(): Auth {
	auth ??= createAuth(getDb(), { secure: !dev && process.env.INSECURE_COOKIES !== '1' });
	return auth;
}
