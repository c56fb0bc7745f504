import { defineConfig } from 'vitest/config';

// The reliability suite (test/reliability, issue 16) on its own, after `npm test` has built the
// command line: `npm run test:reliability`, called by .ci/run. Kept out of the main run so its
// three minutes of child processes do not compete with the browser tests' timings.
export default defineConfig({
  test: {
    include: ['test/reliability/**/*.test.ts'],
    environment: 'node',
    pool: 'forks',
    testTimeout: 240_000,
    hookTimeout: 120_000,
    reporters: ['default'],
  },
});
