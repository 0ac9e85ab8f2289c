/**
 * In provider payment mode the server must have the shop's own secret key and webhook secret:
 * without them (or with the local fake's published values) the built server refuses to start,
 * exits non-zero, and says on stderr which variable is missing. A webhook checked against a
 * public secret would let anyone mark a quote paid.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { FAKE_SECRET_KEY, FAKE_WEBHOOK_SECRET, paymentConfig } from '../../src/lib/server/payments';
import { cleanup, ensureBuilt, freshDemoDb, serverRefusal, startServer } from '../helpers/server';

const PORT = 4283;
let dir: string;
let file: string;

beforeAll(async () => {
	await ensureBuilt();
	({ dir, file } = await freshDemoDb());
}, 300_000);

afterAll(() => {
	if (dir) cleanup(dir);
});

const NONE = { PAYMENT_SECRET_KEY: undefined, PAYMENT_WEBHOOK_SECRET: undefined, PAYMENT_FAKE_PORT: undefined };

describe('the built server in provider mode', () => {
	test('with neither key set it exits non-zero and names both variables', async () => {
		const r = await serverRefusal(file, PORT, { ...NONE, PAYMENT_MODE: 'provider' });
		expect(r.code).not.toBe(0);
		expect(r.code).not.toBeNull();
		expect(r.stderr).toContain('PAYMENT_SECRET_KEY is not set');
		expect(r.stderr).toContain('PAYMENT_WEBHOOK_SECRET is not set');
		expect(r.stdout).not.toContain('Listening on');
	}, 60_000);

	test('with only the webhook secret missing it names that one', async () => {
		const r = await serverRefusal(file, PORT, { ...NONE, PAYMENT_MODE: 'provider', PAYMENT_SECRET_KEY: 'sk_test_corvid_hill_own_key' });
		expect(r.code).not.toBe(0);
		expect(r.stderr).toContain('PAYMENT_WEBHOOK_SECRET is not set');
		expect(r.stderr).not.toContain('PAYMENT_SECRET_KEY is not set');
	}, 60_000);

	test("with the local fake's published webhook secret, or a blank one, it refuses too", async () => {
		const fake = await serverRefusal(file, PORT, { ...NONE, PAYMENT_MODE: 'provider', PAYMENT_SECRET_KEY: 'sk_test_corvid_hill_own_key', PAYMENT_WEBHOOK_SECRET: FAKE_WEBHOOK_SECRET });
		expect(fake.code).not.toBe(0);
		expect(fake.stderr).toContain("PAYMENT_WEBHOOK_SECRET is the local fake's published value");
		const blank = await serverRefusal(file, PORT, { ...NONE, PAYMENT_MODE: 'provider', PAYMENT_SECRET_KEY: '  ', PAYMENT_WEBHOOK_SECRET: 'whsec_corvid_hill_own' });
		expect(blank.code).not.toBe(0);
		expect(blank.stderr).toContain('PAYMENT_SECRET_KEY is not set');
	}, 60_000);

	test('a misspelt PAYMENT_MODE is refused rather than read as the fake', async () => {
		const r = await serverRefusal(file, PORT, { ...NONE, PAYMENT_MODE: 'providr' });
		expect(r.code).not.toBe(0);
		expect(r.stderr).toContain('PAYMENT_MODE is "providr"; set it to fake or provider.');
	}, 60_000);

	test('with its own keys it starts and answers', async () => {
		const server = await startServer(file, PORT, { PAYMENT_MODE: 'provider', PAYMENT_SECRET_KEY: 'sk_test_corvid_hill_own_key', PAYMENT_WEBHOOK_SECRET: 'whsec_corvid_hill_own' });
		try {
			const r = await fetch(`${server.origin}/api/health`);
			expect(r.status).toBe(200);
		} finally {
			await server.stop();
		}
	}, 60_000);
});

test('paymentConfig: the fake keeps its local defaults; provider mode takes only the shop’s own values', () => {
	expect(paymentConfig({})).toMatchObject({ mode: 'fake', secretKey: FAKE_SECRET_KEY, webhookSecret: FAKE_WEBHOOK_SECRET });
	expect(paymentConfig({ PAYMENT_MODE: 'provider', PAYMENT_SECRET_KEY: 'sk_own', PAYMENT_WEBHOOK_SECRET: 'whsec_own' })).toMatchObject({ mode: 'provider', secretKey: 'sk_own', webhookSecret: 'whsec_own' });
	expect(() => paymentConfig({ PAYMENT_MODE: 'provider', PAYMENT_WEBHOOK_SECRET: 'whsec_own' })).toThrow('PAYMENT_SECRET_KEY is not set');
	expect(() => paymentConfig({ PAYMENT_MODE: 'provider', PAYMENT_SECRET_KEY: FAKE_SECRET_KEY, PAYMENT_WEBHOOK_SECRET: 'whsec_own' })).toThrow("PAYMENT_SECRET_KEY is the local fake's published value");
});
