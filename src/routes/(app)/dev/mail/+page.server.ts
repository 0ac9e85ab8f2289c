import { error } from '@sveltejs/kit';
import { desc } from 'drizzle-orm';
import { getDb } from '$lib/server/db';
import { devMail } from '$lib/server/db/schema';
import { mailFakeEnabled } from '$lib/server/customer-services';
import type { PageServerLoad } from './$types';

/** The local test mailbox: only while the SMTP fake runs; otherwise there is no such page. */
export const load: PageServerLoad = async () => {
	if (!mailFakeEnabled()) error(404, { message: 'Not found' });
	const mail = getDb()
		.select({ id: devMail.id, mailFrom: devMail.mailFrom, rcptTo: devMail.rcptTo, subject: devMail.subject, receivedAt: devMail.receivedAt })
		.from(devMail)
		.orderBy(desc(devMail.id))
		.limit(200)
		.all();
	return { mail: mail.map((m) => ({ ...m, receivedAt: m.receivedAt.toISOString() })) };
};
