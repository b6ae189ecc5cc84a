import { defineConfig } from 'vitest/config';
import base from './vitest.config.mts';

/*
 * The crash harness on its own (`npm run test:crash`): it starts and kills the built server many times, so it
 * runs after the other suites with the machine to itself instead of competing with them for two cores.
 * Spread, not mergeConfig: merging would append to the base `include` and run every suite again.
 */
export default defineConfig({
  ...base,
  // no template database: the harness starts the built server on databases of its own
  test: { ...base.test, include: ['test/crash/**/*.crash-spec.ts'], globalSetup: [], testTimeout: 600_000, hookTimeout: 60_000 },
});
