// Mutation testing of the statistical core (src/stats, src/metrics, src/compare): `npm run mutate`,
// or one folder at a time with `npm run mutate -- --mutate 'src/stats/**/*.ts'`. Not part of
// `npm test`: a full run takes tens of minutes on two cores. See DEVELOPERS.md, "Mutation testing".
/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
  mutate: ['src/stats/**/*.ts', 'src/metrics/**/*.ts', 'src/compare/**/*.ts', '!src/**/*.d.ts', '!src/**/index.ts'],
  testRunner: 'vitest',
  // tests that run the CLI start worker threads from dist/: build it inside the sandbox first
  buildCommand: 'npx tsc -p tsconfig.json',
  vitest: { configFile: 'vitest.mutate.config.ts', related: false },
  coverageAnalysis: 'perTest',
  concurrency: 2,
  timeoutMS: 10000,
  reporters: ['clear-text', 'progress-append-only', 'json'],
  jsonReporter: { fileName: 'reports/mutation/mutation.json' },
  tempDirName: '.stryker-tmp',
  cleanTempDir: 'always',
  thresholds: { high: 95, low: 90, break: null },
};
