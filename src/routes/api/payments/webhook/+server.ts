import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError } from '$lib/server/http';
import { customerServices } from '$lib/server/customer-services';
import { handlePaymentWebhook, paymentConfig } from '$lib/server/payments';
import type { RequestHandler } from './$types';

/** The payment provider's webhook: no session; the signature is the check. */
export const POST: RequestHandler = async ({ request }) => {
	const services = customerServices();
	if (!services) return apiError(503, 'unavailable', 'Payments are not running.');
	const payload = await request.text();
	if (payload.length > 256 * 1024) return apiError(413, 'too_large', 'The body is too large.');
	const out = handlePaymentWebhook(getDb(), services.stripe, paymentConfig().webhookSecret, payload, request.headers.get('stripe-signature'));
	if (out.status === 400) return apiError(400, 'bad_signature', out.message);
	return json({ received: true, result: out.result });
};
