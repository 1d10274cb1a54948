import { defineConfig } from 'vitest/config';

// The tests that guard src/stats, src/metrics and src/compare, for `npm run mutate` only.
export default defineConfig({
  test: {
    include: ['test/stats/**/*.test.ts', 'test/metrics/**/*.test.ts', 'test/compare/**/*.test.ts'],
    // Files that run the whole CLI (eval with its worker threads) per mutant: a mutant covered by
    // one costs a full run of each, which made a stats run take hours on two cores. The unit tests
    // of the three folders are what this measures; npm test runs these end-to-end files.
    exclude: ['test/compare/intervals-e2e.test.ts', 'test/compare/match.test.ts', 'test/compare/within-report.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
