import { defineConfig } from '@playwright/test';

const PORT = Number(process.env.E2E_PORT ?? 4173);
const origin = `http://localhost:${PORT}`;

export default defineConfig({
	testDir: 'tests/e2e',
	fullyParallel: false,
	workers: 1,
	// no retries, in CI too: a test that passes only on a second try is a failure to fix, not to hide
	retries: 0,
	timeout: 60_000,
	expect: { timeout: 10_000 },
	reporter: process.env.CI ? [['list'], ['json', { outputFile: 'reports/playwright.json' }]] : [['list']],
	use: {
		baseURL: origin,
		trace: 'retain-on-failure',
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic']
		}
	},
	webServer: {
		command: 'npx vite build --logLevel warn && npx tsx scripts/seed.ts --fresh && node server.js',
		url: `${origin}/api/health`,
		reuseExistingServer: false,
		// build + seed + start; a busy shared machine may need longer (E2E_SERVER_TIMEOUT_MS)
		timeout: Number(process.env.E2E_SERVER_TIMEOUT_MS ?? 180_000),
		stdout: 'ignore',
		stderr: 'pipe',
		env: {
			PORT: String(PORT),
			HOST: '127.0.0.1',
			ORIGIN: origin,
			DATABASE_URL: 'data/e2e.db',
			// customer e-mail and payments: the local SMTP and payment fakes on free ports
			MAIL_MODE: 'fake',
			PAYMENT_MODE: 'fake',
			OUTBOX_POLL_MS: '250'
		}
	}
});
