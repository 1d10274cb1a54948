import { defineConfig } from 'vitest/config';

/**
 * `npm run test:integration`: real schedulers (GNU parallel, a one-machine Slurm cluster) and the
 * package installed from its tarball. Kept out of `npm test` (vitest.config.ts includes only
 * *.test.ts); one file at a time, because the machine has few cores and these tests are heavy.
 */
export default defineConfig({
  test: {
    include: ['test/integration/**/*.itest.ts'],
    fileParallelism: false,
    testTimeout: 600_000,
    hookTimeout: 120_000,
  },
});
