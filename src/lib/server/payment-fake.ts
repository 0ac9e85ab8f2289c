/**
 * A local stand-in for the payment provider's API, for dev, demo and tests only. It binds
 * to 127.0.0.1 and answers what this app uses: `POST /v1/checkout/sessions` (form-encoded,
 * bearer key) and a hosted checkout page; "Pay" posts a signed `checkout.session.completed`
 * webhook to the app and sends the browser back to the success URL. Test keys only.
 */
import Stripe from 'stripe';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';

export interface PaymentFake {
	port: number;
	url: string;
	sessions: Map<string, FakeSession>;
	close(): Promise<void>;
}

interface FakeSession {
	id: string;
	object: 'checkout.session';
	amount_total: number;
	currency: string;
	client_reference_id: string | null;
	metadata: Record<string, string>;
	mode: string;
	payment_status: 'unpaid' | 'paid';
	status: 'open' | 'complete';
	success_url: string;
	cancel_url: string | null;
	url: string;
	created: number;
	livemode: false;
	name: string;
}

function readBody(req: IncomingMessage): Promise<string> {
	return new Promise((resolve, reject) => {
		const chunks: Buffer[] = [];
		let size = 0;
		req.on('data', (c: Buffer) => {
			size += c.length;
			if (size > 256 * 1024) req.destroy(new Error('too large'));
			else chunks.push(c);
		});
		req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
		req.on('error', reject);
	});
}

function apiError(res: ServerResponse, status: number, type: string, message: string) {
	res.writeHead(status, { 'content-type': 'application/json' });
	res.end(JSON.stringify({ error: { type, message } }));
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export async function startPaymentFake(opts: { port?: number; secretKey: string; webhookSecret: string; webhookUrl: string }): Promise<PaymentFake> {
	const sessions = new Map<string, FakeSession>();
	const signer = new Stripe(opts.secretKey, { telemetry: false });
	let base = '';

	const server = createServer(async (req, res) => {
		try {
			const url = new URL(req.url ?? '/', 'http://127.0.0.1');
			if (req.method === 'POST' && url.pathname === '/v1/checkout/sessions') {
				if (req.headers.authorization !== `Bearer ${opts.secretKey}`) {
					return apiError(res, 401, 'invalid_request_error', 'Invalid API Key provided.');
				}
				const form = new URLSearchParams(await readBody(req));
				const amount = Number(form.get('line_items[0][price_data][unit_amount]'));
				const quantity = Number(form.get('line_items[0][quantity]') ?? 1);
				const success = form.get('success_url');
				if (!Number.isInteger(amount) || amount <= 0 || !success) {
					return apiError(res, 400, 'invalid_request_error', 'A line item amount and a success_url are required.');
				}
				const metadata: Record<string, string> = {};
				for (const [k, v] of form) {
					const m = /^metadata\[(.+)\]$/.exec(k);
					if (m) metadata[m[1]] = v;
				}
				const id = `cs_test_${randomBytes(12).toString('hex')}`;
				const session: FakeSession = {
					id,
					object: 'checkout.session',
					amount_total: amount * quantity,
					currency: form.get('line_items[0][price_data][currency]') ?? 'usd',
					client_reference_id: form.get('client_reference_id'),
					metadata,
					mode: form.get('mode') ?? 'payment',
					payment_status: 'unpaid',
					status: 'open',
					success_url: success,
					cancel_url: form.get('cancel_url'),
					url: `${base}/pay/${id}`,
					created: Math.floor(Date.now() / 1000),
					livemode: false,
					name: form.get('line_items[0][price_data][product_data][name]') ?? 'Payment'
				};
				sessions.set(id, session);
				res.writeHead(200, { 'content-type': 'application/json', 'request-id': `req_${randomBytes(6).toString('hex')}` });
				return res.end(JSON.stringify(session));
			}
			const pay = /^\/pay\/(cs_test_[0-9a-f]+)$/.exec(url.pathname);
			if (pay) {
				const s = sessions.get(pay[1]);
				if (!s) {
					res.writeHead(404, { 'content-type': 'text/plain' });
					return res.end('No such checkout.');
				}
				if (req.method === 'GET') {
					const amount = `${(s.amount_total / 100).toFixed(2)} ${s.currency.toUpperCase()}`;
					res.writeHead(200, { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' });
					return res.end(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>Test checkout</title>
<style>body{font-family:system-ui,sans-serif;max-width:28rem;margin:2rem auto;padding:0 1rem;color:#1a1e24}button{min-height:48px;padding:0 1.5rem;font-size:1.1rem;font-weight:600;background:#2f5cb8;color:#fff;border:0;border-radius:6px}.note{border:2px dashed #999;padding:.5rem;font-size:.9rem}</style></head>
<body><p class="note">Local test checkout. No real payment is taken.</p><h1>${esc(s.name)}</h1><p>Amount due: <strong data-testid="checkout-amount">${esc(amount)}</strong></p>
<form method="post" action="/pay/${s.id}"><button type="submit">Pay</button></form>
${s.cancel_url ? `<p><a href="${esc(s.cancel_url)}">Cancel and go back</a></p>` : ''}</body></html>`);
				}
				if (req.method === 'POST') {
					if (s.status !== 'complete') {
						s.status = 'complete';
						s.payment_status = 'paid';
						const event = {
							id: `evt_test_${randomBytes(12).toString('hex')}`,
							object: 'event',
							type: 'checkout.session.completed',
							created: Math.floor(Date.now() / 1000),
							livemode: false,
							data: { object: s }
						};
						const payload = JSON.stringify(event);
						const header = signer.webhooks.generateTestHeaderString({ payload, secret: opts.webhookSecret });
						const delivered = await fetch(opts.webhookUrl, {
							method: 'POST',
							headers: { 'content-type': 'application/json', 'stripe-signature': header },
							body: payload
						}).catch((e: unknown) => ({ ok: false, status: 0, statusText: `${String(e)} ${String((e as { cause?: unknown }).cause ?? '')}`.trim() }));
						if (!delivered.ok) {
							res.writeHead(502, { 'content-type': 'text/plain' });
							return res.end(`Payment taken, but the shop's webhook did not accept it (${delivered.status} ${delivered.statusText}).`);
						}
					}
					res.writeHead(303, { location: s.success_url });
					return res.end();
				}
			}
			apiError(res, 404, 'invalid_request_error', `Unrecognized request URL (${req.method}: ${url.pathname}).`);
		} catch (e) {
			apiError(res, 500, 'api_error', e instanceof Error ? e.message : String(e));
		}
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(opts.port ?? 0, '127.0.0.1', () => resolve());
	});
	const port = (server.address() as AddressInfo).port;
	base = `http://127.0.0.1:${port}`;
	return {
		port,
		url: base,
		sessions,
		close: () =>
			new Promise<void>((resolve) => {
				server.closeAllConnections();
				server.close(() => resolve());
			})
	};
}
