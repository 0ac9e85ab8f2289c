import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1', port: 5173 },
	test: {
		include: ['tests/unit/**/*.test.ts', 'tests/integration/**/*.test.ts', 'tests/server/**/*.test.ts'],
		environment: 'node',
		expect: { requireAssertions: true },
		testTimeout: 20000,
		pool: 'forks',
		reporters: process.env.CI ? ['default', ['json', { outputFile: 'reports/vitest.json' }]] : ['default']
	}
});
