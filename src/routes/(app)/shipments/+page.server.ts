import { fail, redirect } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { ShipmentError, createShipment, listShipments, newShipmentSchema, openCustomerOrders, shipLocations, shippableUnits, stockByLocation } from '$lib/server/shipments';
import { pokeOutbox } from '$lib/server/customer-services';
import { STEERING_ROLES } from '$lib/domain/auth/roles';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, locals }) => {
	const db = getDb();
	const role = locals.user!.role;
	const canShip = STEERING_ROLES.includes(role);
	return {
		shippable: shippableUnits(db, role),
		shipments: listShipments(db, role),
		// the new-shipment form's choices go only to those who send shipments
		locations: canShip ? shipLocations(db) : [],
		orders: canShip ? openCustomerOrders(db, role) : [],
		stock: stockByLocation(db),
		preselectOrder: Number(url.searchParams.get('order')) || null,
		canShip
	};
};

export const actions: Actions = {
	create: async ({ request, locals }) => {
		if (!STEERING_ROLES.includes(locals.user!.role)) return fail(403, { message: 'Only the lead or the owner sends shipments.' });
		const data = await request.formData();
		const raw = {
			destination: String(data.get('destination') ?? ''),
			locationId: data.get('locationId') || undefined,
			orderId: data.get('orderId') || undefined,
			reference: String(data.get('reference') ?? ''),
			shipTo: String(data.get('shipTo') ?? ''),
			carrier: String(data.get('carrier') ?? ''),
			trackingNumber: String(data.get('trackingNumber') ?? ''),
			serials: data.getAll('serial').map(String)
		};
		const parsed = newShipmentSchema.safeParse(raw);
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0]?.message ?? 'Check the shipment.', values: raw });
		let id: number;
		try {
			id = createShipment(getDb(), { id: locals.user!.id, role: locals.user!.role }, parsed.data).id;
		} catch (e) {
			if (e instanceof ShipmentError) return fail(400, { message: e.message, values: raw });
			throw e;
		}
		pokeOutbox();
		redirect(303, `/shipments/${id}`);
	}
};
