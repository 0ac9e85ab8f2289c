/**
 * Demo rows for customers' own units: two rebuild orders (one waiting for the customer's
 * answer to its quote, one approved, paid and in work), the depots the shop ships to, the
 * quote settings, and each order's status e-mail queued in the outbox. Invented people,
 * `.example` addresses.
 */
import type { Role } from '../domain/auth/roles';
import type { ActionName } from '../domain/units/actions';
import { decide } from '../domain/units/machine';
import type { UnitState } from '../domain/units/states';
import { quoteTotals } from '../domain/customer/quote';
import type { Tx } from './db';
import { coreLot, quote, quoteLine, rebuildOrder, rebuildSetting, scrapReason, shipLocation, unit, unitEvent, unitPhoto, unitPhotoShare } from './db/schema';
import sharp from 'sharp';
import { stagePhotos, type StagedPhotos, type StoredPhoto } from './photos';
import { queueNotice } from './rebuild-notify';
import { issueTrackLink } from './track-links';
import { allocateSerials } from './units';
import { trackUrl } from './rebuild-orders';

export const DEMO_DEPOTS = [
	{ name: 'North Depot', address: '14 Kestrel Row, Upper Pellmarsh' },
	{ name: 'Lakes Depot', address: '3 Reedwater Lane, Millmere' },
	{ name: 'Plains Depot', address: '88 Long Furrow Road, Haybury' },
	{ name: 'Coast Depot', address: '2 Harbour Stair, Saltwick' }
];

interface Ctx {
	now: Date;
	random: () => number;
	shopName: string;
	office: { id: string; role: Role };
	tech: { id: string; role: Role };
	stationIds: Map<string, number>;
	modelIds: number[];
	/** Teardown photos for the first order (from `demoTeardownPhotos`); one of them is shared with the customer. */
	photos?: readonly StoredPhoto[];
}

/**
 * Two drawn stand-ins for teardown photos (a housing with a marked crack, a compressor wheel),
 * stored the way the floor stores camera uploads. Drawings, not pictures of any real part.
 */
export async function demoTeardownPhotos(): Promise<StagedPhotos> {
	const blades = Array.from({ length: 12 }, (_, k) => {
		const a = (k * Math.PI) / 6;
		return `<path d="M320 240 L${(320 + 150 * Math.cos(a)).toFixed(1)} ${(240 + 150 * Math.sin(a)).toFixed(1)}" stroke="#c9ced6" stroke-width="10" stroke-linecap="round"/>`;
	}).join('');
	const svgs = {
		'teardown-housing.png': `<svg xmlns="http://www.w3.org/2000/svg" width="640" height="480"><rect width="640" height="480" fill="#2b2f36"/><circle cx="320" cy="240" r="170" fill="#6b7079"/><circle cx="320" cy="240" r="95" fill="#2b2f36"/><circle cx="470" cy="150" r="28" fill="#3a3f47"/><path d="M452 172 L430 196 L441 210 L418 236 L428 250 L404 276" stroke="#111" stroke-width="6" fill="none"/><circle cx="430" cy="220" r="72" stroke="#e8a33d" stroke-width="5" fill="none" stroke-dasharray="14 10"/></svg>`,
		'teardown-wheel.png': `<svg xmlns="http://www.w3.org/2000/svg" width="640" height="480"><rect width="640" height="480" fill="#30343b"/><circle cx="320" cy="240" r="165" fill="#8d939c"/>${blades}<circle cx="320" cy="240" r="36" fill="#5d636c"/></svg>`
	};
	const files = await Promise.all(Object.entries(svgs).map(async ([name, svg]) => ({ name, bytes: new Uint8Array(await sharp(Buffer.from(svg)).png().toBuffer()) })));
	const stored = await stagePhotos(files);
	if (!stored.ok) throw new Error(stored.message);
	return stored.staged;
}

const STATION_FOR: Partial<Record<ActionName, string>> = {
	inspect: 'TEARDOWN-1',
	accept: 'TEARDOWN-1',
	clean: 'WASH',
	machine: 'LATHE-B'
};
const STAGE_OF: Record<string, 'teardown' | 'clean' | 'machine'> = { 'TEARDOWN-1': 'teardown', WASH: 'clean', 'LATHE-B': 'machine' };

export function seedCustomerOrders(tx: Tx, ctx: Ctx): { orders: number } {
	tx.insert(rebuildSetting).values([
		{ key: 'shopName', value: ctx.shopName },
		{ key: 'taxRateBp', value: '825' }
	]).run();
	for (const d of DEMO_DEPOTS) tx.insert(shipLocation).values(d).run();
	tx.insert(scrapReason).values({ code: 'CUST-DECLINED', label: 'Customer declined the quote and asked us to scrap it', category: 'customer' }).run();

	const day = 86_400_000;
	const receivedAt = new Date(ctx.now.getTime() - 4 * day);
	const lotDay = receivedAt.toISOString().slice(0, 10);
	const lot = tx
		.insert(coreLot)
		.values({ code: `CR${lotDay.slice(2).replaceAll('-', '')}`, source: 'customer_return', receivedOn: lotDay, notes: "Customers' own units for rebuild.", createdAt: receivedAt })
		.returning({ id: coreLot.id })
		.get();

	const orders = [
		{
			customerName: 'Maren Holloway',
			email: 'maren.holloway@mail.example',
			phone: '555-0142',
			shipAddress: '27 Thistle Bank\nPellmarsh',
			complaint: 'Whistles under boost and smokes blue at idle.',
			tag: 'MH-447120',
			moves: ['inspect', 'accept'] as ActionName[],
			quote: 'sent' as const
		},
		{
			customerName: 'Osric Penhallow',
			email: 'osric@penhallow-haulage.example',
			phone: '555-0178',
			shipAddress: 'Penhallow Haulage\nUnit 4, Drover Yard\nHaybury',
			complaint: 'Shaft play found at service; wastegate rattles.',
			tag: 'OP-902311',
			moves: ['inspect', 'accept', 'clean', 'machine'] as ActionName[],
			quote: 'paid' as const
		}
	];
	const serials = allocateSerials(tx, orders.length);
	orders.forEach((o, i) => {
		const serial = serials[i];
		let state: UnitState = 'received';
		let t = receivedAt.getTime() + i * 3_600_000;
		const events: (typeof unitEvent.$inferInsert)[] = [
			{ unitId: 0, seq: 1, fromState: null, toState: 'received', action: 'receive', userId: ctx.office.id, at: new Date(t), idempotencyKey: `seed:${serial}:1` }
		];
		const quoteAt = t + 30 * 3_600_000;
		for (const action of o.moves) {
			const stationCode = STATION_FOR[action]!;
			const d = decide(
				{ serial, state, held: false, holdReason: null },
				{ action, role: ctx.tech.role, stationStage: STAGE_OF[stationCode] },
				{ quoteApproved: o.quote === 'paid' }
			);
			if (!d.ok) throw new Error(`demo seed made an impossible move: ${d.message}`);
			t += (action === 'clean' ? 40 : 6 + ctx.random() * 10) * 3_600_000;
			events.push({
				unitId: 0,
				seq: events.length + 1,
				fromState: d.from,
				toState: d.to,
				action,
				stationId: ctx.stationIds.get(stationCode)!,
				userId: ctx.tech.id,
				at: new Date(Math.min(t, ctx.now.getTime() - 60_000)),
				idempotencyKey: `seed:${serial}:${events.length + 1}`
			});
			state = d.to;
		}
		const last = events[events.length - 1].at as Date;
		const u = tx
			.insert(unit)
			.values({
				serial,
				originalTag: o.tag,
				lotId: lot.id,
				modelId: ctx.modelIds[(i * 3 + 1) % ctx.modelIds.length],
				state,
				version: events.length,
				stateSince: last,
				createdAt: receivedAt,
				updatedAt: last
			})
			.returning({ id: unit.id })
			.get();
		for (const e of events) tx.insert(unitEvent).values({ ...e, unitId: u.id }).run();
		const order = tx
			.insert(rebuildOrder)
			.values({
				code: `RO-${ctx.now.toISOString().slice(2, 4)}-${String(i + 1).padStart(4, '0')}`,
				customerName: o.customerName,
				email: o.email,
				phone: o.phone,
				shipAddress: o.shipAddress,
				complaint: o.complaint,
				promisedOn: new Date(ctx.now.getTime() + (10 + i * 4) * day).toISOString().slice(0, 10),
				unitId: u.id,
				createdBy: ctx.office.id,
				createdAt: receivedAt
			})
			.returning()
			.get();
		const token = issueTrackLink(tx, order.id, receivedAt);
		queueNotice(tx, order, 'received', { link: trackUrl(token) }, ctx.now);
		const lines = [
			{ kind: 'part' as const, description: 'Bearing and seal kit', quantityHundredths: 100, unitPriceCents: 8950 },
			{ kind: 'part' as const, description: i === 0 ? 'Compressor wheel' : 'Turbine shaft and wheel', quantityHundredths: 100, unitPriceCents: i === 0 ? 14200 : 21800 },
			{ kind: 'labour' as const, description: 'Rebuild and balance', quantityHundredths: 250, unitPriceCents: 9500 }
		];
		const coreCents = i === 0 ? 0 : -5000;
		const totals = quoteTotals(lines, 825, coreCents);
		const q = tx
			.insert(quote)
			.values({
				orderId: order.id,
				status: o.quote === 'paid' ? 'approved' : 'sent',
				taxRateBp: 825,
				coreCents,
				coreNote: coreCents ? 'Old housing kept by the shop' : '',
				subtotalCents: totals.subtotalCents,
				taxCents: totals.taxCents,
				totalCents: totals.totalCents,
				sentAt: new Date(quoteAt),
				decidedAt: o.quote === 'paid' ? new Date(quoteAt + 3_600_000) : null,
				paidAt: o.quote === 'paid' ? new Date(quoteAt + 4_000_000) : null,
				paidCents: o.quote === 'paid' ? totals.totalCents : null,
				createdAt: new Date(quoteAt)
			})
			.returning({ id: quote.id })
			.get();
		lines.forEach((l, n) => tx.insert(quoteLine).values({ ...l, quoteId: q.id, sortOrder: n }).run());
		if (i === 0 && ctx.photos?.length) {
			const takenAt = events.find((e) => e.action === 'accept')!.at as Date;
			ctx.photos.forEach((p, n) => {
				const photo = tx
					.insert(unitPhoto)
					.values({ unitId: u.id, sha256: p.sha256, mime: p.mime, bytes: p.bytes, width: p.width, height: p.height, originalName: p.originalName, userId: ctx.tech.id, at: takenAt })
					.returning({ id: unitPhoto.id })
					.get();
				if (n === 0) {
					const caption = 'Crack found next to the wastegate port (circled): the housing is replaced, see the quote.';
					tx.insert(unitPhotoShare).values({ photoId: photo.id, orderId: order.id, shared: true, caption, userId: ctx.office.id, at: new Date(quoteAt) }).run();
				}
			});
		}
	});
	return { orders: orders.length };
}
