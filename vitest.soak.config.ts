import { defineConfig } from 'vitest/config';

// Repeated-trial and soak checks (20-try gate verdicts under load, large fuzz): minutes, not
// seconds, so they run in `npm run soak` (called by .ci/run after `npm test`), not in `npm test`.
export default defineConfig({
  test: {
    include: ['test/soak/**/*.test.ts'],
    testTimeout: 600_000,
    hookTimeout: 120_000,
    pool: 'forks',
    fileParallelism: false,
    reporters: ['default', ['json', { outputFile: 'test/.artifacts/vitest-soak-results.json' }]],
  },
});
