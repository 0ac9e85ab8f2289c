import { fail, redirect } from '@sveltejs/kit';
import { asc, eq } from 'drizzle-orm';
import { getDb } from '$lib/server/db';
import { turboModel } from '$lib/server/db/schema';
import { OrderError, createRebuildOrder, listOrders, newOrderSchema } from '$lib/server/rebuild-orders';
import { getRebuildSettings, setRebuildSetting } from '$lib/server/rebuild-settings';
import { mailFakeEnabled, pokeOutbox } from '$lib/server/customer-services';
import { zodFields } from '$lib/server/http';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const db = getDb();
	return {
		orders: listOrders(db),
		models: db.select({ code: turboModel.code, description: turboModel.description }).from(turboModel).where(eq(turboModel.active, true)).orderBy(asc(turboModel.code)).all(),
		settings: getRebuildSettings(db),
		mailFake: mailFakeEnabled()
	};
};

function formValues(data: FormData) {
	const s = (k: string) => String(data.get(k) ?? '');
	return {
		customerName: s('customerName'),
		email: s('email'),
		phone: s('phone'),
		shipAddress: s('shipAddress'),
		modelCode: s('modelCode'),
		originalTag: s('originalTag'),
		complaint: s('complaint'),
		promisedOn: s('promisedOn'),
		notifyReceived: data.get('notifyReceived') === 'on',
		notifyQuote: data.get('notifyQuote') === 'on',
		notifyInWork: data.get('notifyInWork') === 'on',
		notifyShipped: data.get('notifyShipped') === 'on'
	};
}

export const actions: Actions = {
	create: async ({ request, locals }) => {
		const values = formValues(await request.formData());
		const parsed = newOrderSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { values, fields: zodFields(parsed.error), message: parsed.error.issues[0]?.message ?? 'Check the form.' });
		}
		let id: number;
		try {
			const made = createRebuildOrder(getDb(), { id: locals.user!.id, role: locals.user!.role }, parsed.data);
			id = made.order.id;
		} catch (e) {
			if (e instanceof OrderError) return fail(400, { values, fields: e.field ? { [e.field]: [e.message] } : {}, message: e.message });
			throw e;
		}
		pokeOutbox();
		redirect(303, `/orders/${id}?created=1`);
	},
	settings: async ({ request, locals }) => {
		if (locals.user!.role !== 'owner') return fail(403, { settingsMessage: 'Only the owner changes the shop settings.' });
		const data = await request.formData();
		const shopName = String(data.get('shopName') ?? '').trim();
		const tax = String(data.get('taxRatePercent') ?? '').trim();
		const m = /^(\d{1,2})(?:\.(\d{1,2}))?$/.exec(tax);
		if (!shopName || shopName.length > 120) return fail(400, { settingsMessage: 'Give the shop name (up to 120 characters).' });
		if (!m) return fail(400, { settingsMessage: 'Give the tax rate as a percentage such as 8.25.' });
		const bp = Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
		const db = getDb();
		db.transaction(() => {
			setRebuildSetting(db, 'shopName', shopName);
			setRebuildSetting(db, 'taxRateBp', String(bp));
		}, { behavior: 'immediate' });
		return { settingsMessage: 'Saved.' };
	}
};
