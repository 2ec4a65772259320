import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    globalSetup: ['test/setup/global-setup.ts'],
    // Child processes of bin/halfswing.js run the sources through tsx, never a possibly stale dist/ bundle
    // (test/build/bundle.test.ts builds a fresh bundle and checks it against the sources).
    env: { HALFSWING_DEV: '1' },
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
    reporters: ['default', './test/setup/summary-reporter.ts'],
  },
});
