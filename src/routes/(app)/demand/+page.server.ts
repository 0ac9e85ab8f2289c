import { fail } from '@sveltejs/kit';
import { asc } from 'drizzle-orm';
import { INTAKE_ROLES } from '$lib/domain/auth/roles';
import { ORDER_STATUSES, type OrderStatus } from '$lib/domain/orders/channels';
import { getDb } from '$lib/server/db';
import { turboModel } from '$lib/server/db/schema';
import { maySee } from '$lib/server/access';
import { createOrder, listOrders, setOrderStatus, type OrderView } from '$lib/server/orders';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, locals }) => {
	const db = getDb();
	const raw = url.searchParams.get('status') ?? 'open';
	const status = raw === 'all' || (ORDER_STATUSES as readonly string[]).includes(raw) ? (raw as OrderStatus | 'all') : 'open';
	return {
		status,
		// the customer on a walk-in order only for roles that may see customers
		orders: listOrders(db, { status, limit: 500 }).map(({ customer, ...o }): Omit<OrderView, 'customer'> & { customer?: string } =>
			maySee(locals.user!.role, 'customer') ? { ...o, customer } : o
		),
		models: db.select({ code: turboModel.code }).from(turboModel).orderBy(asc(turboModel.code)).all().map((m) => m.code),
		canEdit: INTAKE_ROLES.includes(locals.user!.role)
	};
};

function str(form: FormData, name: string): string {
	const v = form.get(name);
	return typeof v === 'string' ? v.slice(0, 2000) : '';
}

export const actions: Actions = {
	create: async ({ request, locals }) => {
		const form = await request.formData();
		const models = form.getAll('model').map(String);
		const qty = form.getAll('quantity').map(String);
		const lines = models.map((model, i) => ({ model, quantity: qty[i] ?? '' })).filter((l) => l.model || l.quantity);
		const values = {
			ref: str(form, 'ref'),
			channel: str(form, 'channel'),
			customer: str(form, 'customer'),
			orderedOn: str(form, 'orderedOn'),
			dueOn: str(form, 'dueOn'),
			notes: str(form, 'notes')
		};
		const u = locals.user!;
		const r = createOrder(getDb(), { id: u.id, role: u.role }, { ...values, channel: values.channel as 'web', lines: lines as never });
		if (!r.ok) return fail(r.status, { message: r.message, fields: r.fields ?? {}, values, lines });
		return { done: `Order ${values.ref} saved.` };
	},
	status: async ({ request }) => {
		const form = await request.formData();
		const status = str(form, 'status') as OrderStatus;
		if (!(ORDER_STATUSES as readonly string[]).includes(status)) return fail(400, { message: 'Choose a status.' });
		if (!setOrderStatus(getDb(), Number(str(form, 'id')), status)) return fail(404, { message: 'No such order.' });
		return { done: `Order marked ${status}.` };
	}
};
