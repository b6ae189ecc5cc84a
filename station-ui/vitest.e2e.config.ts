import { defineConfig } from 'vitest/config';

/**
 * Real-browser tests: a built station server with the simulated fixture, and Chromium driven by
 * playwright-core. Files run one after another: each starts its own server, and the machine has 2 cores.
 */
export default defineConfig({
  test: {
    environment: 'node',
    include: ['e2e/**/*.spec.ts'],
    fileParallelism: false,
    // one seeded database for the whole run, copied by every server the specs start
    globalSetup: ['./e2e/support/template-database.ts'],
    // Seeding + server start take a few seconds on 2 cores; a page step may wait on the server.
    testTimeout: 60_000,
    hookTimeout: 120_000,
    teardownTimeout: 20_000,
  },
});
