import { defineConfig } from 'vitest/config';

// The tests that guard src/stats, src/metrics and src/compare, for `npm run mutate` only.
export default defineConfig({
  test: {
    include: ['test/stats/**/*.test.ts', 'test/metrics/**/*.test.ts', 'test/compare/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
