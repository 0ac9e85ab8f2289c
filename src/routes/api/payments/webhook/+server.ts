import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { apiError, readBodyText } from '$lib/server/http';
import { MAX_JSON_DEPTH, jsonDepth, tooDeepMessage } from '$lib/domain/input/json';
import { customerServices } from '$lib/server/customer-services';
import { handlePaymentWebhook, paymentConfig } from '$lib/server/payments';
import type { RequestHandler } from './$types';

const MAX_WEBHOOK_BYTES = 256 * 1024;

/** The payment provider's webhook: no session; the signature is the check. */
export const POST: RequestHandler = async ({ request }) => {
	const services = customerServices();
	if (!services) return apiError(503, 'unavailable', 'Payments are not running.');
	const body = await readBodyText(request, MAX_WEBHOOK_BYTES);
	if (!body.ok) return body.reason === 'too_large' ? apiError(413, 'too_large', 'The body is too large: a webhook takes at most 256 KB.') : apiError(400, 'invalid_json', 'The body is not valid UTF-8 text.');
	const payload = body.text;
	// the signature is checked on the exact text; the nesting is checked first so nothing recursive sees a hostile body
	if (jsonDepth(payload, MAX_JSON_DEPTH + 1) > MAX_JSON_DEPTH) return apiError(400, 'too_deep', tooDeepMessage());
	const out = handlePaymentWebhook(getDb(), services.stripe, paymentConfig().webhookSecret, payload, request.headers.get('stripe-signature'));
	if (out.status === 400) return apiError(400, out.code, out.message);
	return json({ received: true, result: out.result });
};
