import { eq } from 'drizzle-orm';
import { getDb } from '$lib/server/db';
import { devMail } from '$lib/server/db/schema';
import { apiError } from '$lib/server/http';
import { mailFakeEnabled } from '$lib/server/customer-services';
import type { RequestHandler } from './$types';

/** One message from the local SMTP fake, raw (RFC 5322), for reading or parsing in tests. */
export const GET: RequestHandler = async ({ params }) => {
	if (!mailFakeEnabled()) return apiError(404, 'not_found', 'Not found.');
	const m = getDb().select().from(devMail).where(eq(devMail.id, Number(params.id))).get();
	if (!m) return apiError(404, 'not_found', 'No such message.');
	return new Response(m.raw, { headers: { 'content-type': 'text/plain; charset=utf-8', 'cache-control': 'no-store' } });
};
