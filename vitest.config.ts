import { configDefaults, defineConfig } from 'vitest/config';

// Unit and integration tests run in Node; test/e2e drives Debian's Chromium against the local
// web host (see test/e2e/harness.ts). No test launches Electron.
export default defineConfig({
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    // test/reliability runs on its own: npm run test:reliability (vitest.reliability.config.ts).
    exclude: [...configDefaults.exclude, 'test/reliability/**'],
    environment: 'node',
    pool: 'forks',
    testTimeout: 60_000,
    hookTimeout: 120_000,
    reporters: ['default'],
  },
});
