import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // Repeated-trial checks and the slow end-to-end files (`*.soak.test.ts`: whole CI scripts,
    // nightly git histories, the 200-file fuzz) run in `npm run soak` (vitest.soak.config.ts).
    exclude: ['test/soak/**', '**/*.soak.test.ts', '**/node_modules/**'],
    // Physics tests integrate seconds of simulated time; allow them room on a 2-core machine.
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // A private TMPDIR for the run; every junit.xml written there is checked by a strict XML parser.
    globalSetup: ['test/support/globalSetup.ts'],
    // The JSON copy feeds the one-line tally .ci/run prints ("N passed, N failed").
    reporters: ['default', ['json', { outputFile: 'test/.artifacts/vitest-results.json' }]],
  },
});
