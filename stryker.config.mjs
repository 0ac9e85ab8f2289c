// Mutation testing (StrykerJS): `npm run test:mutation`. Not part of `npm test` (it takes long).
// Mutates the pure domain and the move core; the tests are the ones in vitest.mutation.config.ts.
// Narrow a run with `npm run test:mutation -- --mutate 'src/lib/domain/stats/**/*.ts'`.
/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
	testRunner: 'vitest',
	vitest: { configFile: 'vitest.mutation.config.ts', related: false },
	plugins: ['@stryker-mutator/vitest-runner'],
	mutate: ['src/lib/domain/**/*.ts', 'src/lib/server/units.ts'],
	coverageAnalysis: 'perTest',
	concurrency: 1,
	incremental: true,
	incrementalFile: 'reports/mutation/stryker-incremental.json',
	timeoutMS: 20000,
	reporters: ['clear-text', 'progress-append-only', 'html', 'json'],
	htmlReporter: { fileName: 'reports/mutation/mutation.html' },
	jsonReporter: { fileName: 'reports/mutation/mutation.json' },
	clearTextReporter: { allowEmojis: false, logTests: false, reportMutants: true, reportScoreTable: true },
	thresholds: { high: 90, low: 80, break: null },
	tempDirName: '.stryker-tmp',
	ignorePatterns: ['build', 'data', 'reports', 'backups', 'bench', 'test-results', 'playwright-report', '.svelte-kit', 'tests/e2e', 'tests/server', '*.db', '*.db-wal', '*.db-shm']
};
