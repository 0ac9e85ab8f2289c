import { error, fail } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { getDb } from '$lib/server/db';
import { scrapReason } from '$lib/server/db/schema';
import { orderDetail, resendTrackLink, revokeOrderLinks, trackUrl, OrderError } from '$lib/server/rebuild-orders';
import { QuoteError, addQuoteLine, lineFormSchema, removeQuoteLine, sendQuote, setQuoteCore, withdrawQuote } from '$lib/server/quotes';
import { getRebuildSettings } from '$lib/server/rebuild-settings';
import { parseMoney, quoteTotals } from '$lib/domain/customer/quote';
import { applyMove } from '$lib/server/units';
import { pokeOutbox } from '$lib/server/customer-services';
import { PhotoShareError, orderPhotos, setPhotoShared, shareFormSchema } from '$lib/server/photo-sharing';
import { INTAKE_ROLES, STEERING_ROLES } from '$lib/domain/auth/roles';
import { badNumberMessage } from '$lib/server/bad-numbers';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const db = getDb();
	const found = orderDetail(db, Number(params.id));
	if (!found) error(404, { message: 'No such rebuild order.' });
	const settings = getRebuildSettings(db);
	let draftTotals: ReturnType<typeof quoteTotals> | null = null;
	try {
		draftTotals = found.quote ? quoteTotals(found.quote.lines, found.quote.status === 'draft' ? settings.taxRateBp : found.quote.taxRateBp, found.quote.coreCents) : null;
	} catch (e) {
		// Totals that do not fit in whole cents (a tax rate set out of range): the page still shows the lines.
		if (badNumberMessage(e) === null) throw e;
	}
	return { ...found, settings, draftTotals, photos: orderPhotos(db, found.order.id) };
};

type Handler = (ctx: { id: number; data: FormData; role: string; userId: string }) => Promise<Record<string, unknown> | void> | Record<string, unknown> | void;

function act(handler: Handler, roles: readonly string[] = INTAKE_ROLES) {
	return async ({ params, request, locals }: { params: { id: string }; request: Request; locals: App.Locals }) => {
		if (!roles.includes(locals.user!.role)) return fail(403, { message: `Your role (${locals.user!.role}) may not do this here.` });
		const id = Number(params.id);
		if (!Number.isSafeInteger(id) || !orderDetail(getDb(), id)) return fail(404, { message: 'No such rebuild order.' });
		try {
			const out = await handler({ id, data: await request.formData(), role: locals.user!.role, userId: locals.user!.id });
			return out ?? { ok: true };
		} catch (e) {
			if (e instanceof QuoteError || e instanceof OrderError || e instanceof PhotoShareError) return fail(400, { message: e.message });
			const bad = badNumberMessage(e);
			if (bad !== null) return fail(400, { message: bad });
			throw e;
		}
	};
}

export const actions: Actions = {
	addLine: act(({ id, data }) => {
		// Only the line's own fields are read and echoed back.
		const line: Record<string, string> = {};
		for (const k of ['kind', 'description', 'quantity', 'unitPrice']) {
			const v = data.get(k);
			if (typeof v === 'string') line[k] = v.slice(0, 500);
		}
		const parsed = lineFormSchema.safeParse(line);
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0]?.message ?? 'Check the line.', line }) as never;
		addQuoteLine(getDb(), id, parsed.data);
	}),
	removeLine: act(({ id, data }) => removeQuoteLine(getDb(), id, Number(data.get('lineId')))),
	setCore: act(({ id, data }) => {
		const cents = parseMoney(String(data.get('core') ?? '0') || '0');
		if (cents === null) return fail(400, { message: 'Give the core charge (or a credit with a minus sign) such as -150.00.' }) as never;
		setQuoteCore(getDb(), id, cents, String(data.get('coreNote') ?? ''));
	}),
	sendQuote: act(({ id }) => {
		sendQuote(getDb(), id);
		pokeOutbox();
	}),
	withdrawQuote: act(({ id }) => withdrawQuote(getDb(), id)),
	sharePhoto: act(({ id, data, userId }) => {
		const fields: Record<string, string> = {};
		for (const k of ['photoId', 'shared', 'caption']) {
			const v = data.get(k);
			if (typeof v === 'string') fields[k] = v.slice(0, 1000);
		}
		const parsed = shareFormSchema.safeParse(fields);
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0]?.message ?? 'Check the photo form.', photoId: Number(fields.photoId) || null, caption: fields.caption ?? '' }) as never;
		const changed = setPhotoShared(getDb(), id, parsed.data, userId);
		const what = parsed.data.shared ? 'The customer sees this photo, with its caption, on their status page.' : 'The customer no longer sees this photo.';
		return { message: changed ? what : 'Nothing to change.' };
	}),
	resendLink: act(({ id }) => {
		const token = resendTrackLink(getDb(), id);
		pokeOutbox();
		return { message: 'A new link was e-mailed; the old one no longer works.', newLink: trackUrl(token) };
	}),
	revokeLink: act(({ id }) => {
		const n = revokeOrderLinks(getDb(), id);
		return { message: n ? 'The status link no longer works.' : 'There was no live link.' };
	}),
	scrapDeclined: act(({ id, userId, role }) => {
		const db = getDb();
		const found = orderDetail(db, id);
		if (!found) throw new OrderError('No such order.');
		if (found.quote?.status !== 'declined' || found.order.declineChoice !== 'scrap') {
			throw new OrderError('Scrap at the customer’s request only after they declined the quote and chose scrapping.');
		}
		if (!db.select().from(scrapReason).where(eq(scrapReason.code, 'CUST-DECLINED')).get()) {
			db.insert(scrapReason).values({ code: 'CUST-DECLINED', label: 'Customer declined the quote and asked us to scrap it', category: 'customer' }).run();
		}
		const r = applyMove(db, { id: userId, role: role as 'lead' }, {
			serial: found.unit.serial,
			action: 'scrap',
			idempotencyKey: `scrap-declined:${id}:${randomUUID()}`,
			data: { reasonCode: 'CUST-DECLINED' }
		});
		if (!r.ok) throw new OrderError(r.message);
		return { message: `${found.unit.serial} is scrapped at the customer's request.` };
	}, STEERING_ROLES)
};
