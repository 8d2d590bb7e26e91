import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    exclude: ['test/bench/**', 'node_modules/**'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // Suites that run cases side by side (the fault-injection suite) start a runner process per case: two
    // at a time keep a two-core machine from starving the instruments' answer timeouts.
    maxConcurrency: 2,
  },
});
