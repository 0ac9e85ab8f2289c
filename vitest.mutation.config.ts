/**
 * The tests the mutation run (`npm run test:mutation`, StrykerJS) uses: the domain's unit tests and
 * the integration tests that drive the move core (`src/lib/server/units.ts`) through its services
 * and JSON routes. The SvelteKit plugin resolves `$lib`, `$app` and `$env` for the route handlers
 * those integration tests call; no CSS plugin is needed.
 */
import { sveltekit } from '@sveltejs/kit/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [sveltekit()],
	test: {
		include: [
			'tests/unit/**/*.test.ts',
			'tests/integration/units-api.test.ts',
			'tests/integration/lot-tally.test.ts'
		],
		environment: 'node',
		expect: { requireAssertions: true },
		testTimeout: 30000,
		reporters: ['default']
	}
});
