import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** A trivial answer: used to see that the server is up, and as the framework's own speed ceiling. */
export const GET: RequestHandler = () => json({ ok: true });
