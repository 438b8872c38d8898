import { defineConfig } from 'vitest/config';

// Repeated-trial and soak checks (20-try gate verdicts under load, large fuzz) and slow end-to-end
// files beside their folders' tests (`*.soak.test.ts`): minutes, not seconds, so they run in
// `npm run soak` (called by .ci/run after `npm test`), not in `npm test`.
export default defineConfig({
  test: {
    include: ['test/soak/**/*.test.ts', 'test/**/*.soak.test.ts'],
    testTimeout: 600_000,
    hookTimeout: 120_000,
    pool: 'forks',
    fileParallelism: false,
    globalSetup: ['test/support/globalSetup.ts'],
    reporters: ['default', ['json', { outputFile: 'test/.artifacts/vitest-soak-results.json' }]],
  },
});
