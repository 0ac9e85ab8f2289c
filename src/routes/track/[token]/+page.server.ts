import { error, fail, redirect } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { resolveTrackToken } from '$lib/server/track-links';
import { setNoticePrefs, trackView } from '$lib/server/rebuild-orders';
import { QuoteError, decideQuote } from '$lib/server/quotes';
import { PaymentError, startCheckout } from '$lib/server/payments';
import { customerServices } from '$lib/server/customer-services';
import { publicBaseUrl } from '$lib/server/rebuild-settings';
import { LINK_NOT_VALID, trackLimiter } from '$lib/server/track-limit';
import { NOTICE_KINDS } from '$lib/domain/customer/progress';
import type { Actions, PageServerLoad } from './$types';

/** Rate limit, then the token: a wrong, expired or revoked token all end in the same 404. */
function guard(token: string, address: string): number {
	const verdict = trackLimiter.take(address, Date.now());
	if (!verdict.allowed) error(429, { message: 'Too many requests from here. Wait a minute and try again.' });
	const orderId = resolveTrackToken(getDb(), token);
	if (orderId === null) error(404, { message: LINK_NOT_VALID });
	return orderId;
}

export const load: PageServerLoad = async ({ params, getClientAddress, setHeaders, url }) => {
	setHeaders({ 'cache-control': 'no-store', 'x-robots-tag': 'noindex' });
	const orderId = guard(params.token, getClientAddress());
	const view = trackView(getDb(), orderId);
	if (!view) error(404, { message: LINK_NOT_VALID });
	return { view, returnedFromPayment: url.searchParams.get('paid') === '1' };
};

export const actions: Actions = {
	approve: async ({ params, getClientAddress }) => {
		const orderId = guard(params.token, getClientAddress());
		try {
			decideQuote(getDb(), orderId, { decision: 'approve' });
		} catch (e) {
			if (e instanceof QuoteError) return fail(400, { message: e.message });
			throw e;
		}
		return { message: 'Thank you: the quote is approved and work can start.' };
	},
	decline: async ({ params, getClientAddress, request }) => {
		const orderId = guard(params.token, getClientAddress());
		const choice = String((await request.formData()).get('choice') ?? '');
		if (choice !== 'return' && choice !== 'scrap') return fail(400, { message: 'Choose whether we send the unit back or scrap it.' });
		try {
			decideQuote(getDb(), orderId, { decision: 'decline', choice });
		} catch (e) {
			if (e instanceof QuoteError) return fail(400, { message: e.message });
			throw e;
		}
		return { message: choice === 'return' ? 'Understood: we will send the unit back unrepaired.' : 'Understood: we will scrap the unit.' };
	},
	pay: async ({ params, getClientAddress }) => {
		const orderId = guard(params.token, getClientAddress());
		const services = customerServices();
		if (!services) return fail(503, { message: 'Payment is not available right now; try again later.' });
		let url: string;
		try {
			url = await startCheckout(getDb(), services.stripe, orderId, `${publicBaseUrl()}/track/${params.token}`);
		} catch (e) {
			if (e instanceof PaymentError) return fail(400, { message: e.message });
			throw e;
		}
		redirect(303, url);
	},
	prefs: async ({ params, getClientAddress, request }) => {
		const orderId = guard(params.token, getClientAddress());
		const data = await request.formData();
		const prefs = Object.fromEntries(NOTICE_KINDS.map((k) => [k, data.get(k) === 'on'])) as Record<(typeof NOTICE_KINDS)[number], boolean>;
		setNoticePrefs(getDb(), orderId, prefs);
		return { message: 'Your e-mail choices are saved.' };
	}
};
