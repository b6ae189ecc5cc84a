import swc from 'unplugin-swc';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  resolve: {
    // tests use the simulator's sources, so no build of mock-fixture is needed first
    alias: { '@railwright/mock-fixture': fileURLToPath(new URL('../mock-fixture/src/index.ts', import.meta.url)) },
  },
  test: {
    globals: false,
    root: './',
    include: ['src/**/*.spec.ts', 'test/**/*.e2e-spec.ts'],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    // each file gets its own temporary SQLite database, a copy of one migrated and seeded here before any
    // file starts (see test/create-test-app.ts); files run in parallel forks
    globalSetup: ['./test/support/template-database.ts'],
    pool: 'forks',
    // Vitest's default is one worker less than the cores: one worker on a 2-core CI machine. The e2e files
    // spend much of their time waiting on SQLite and HTTP, so two workers keep both cores busy.
    maxWorkers: 2,
  },
  plugins: [
    // Nest needs decorator metadata, which Vite's default transform does not emit
    swc.vite({ module: { type: 'es6' } }),
  ],
});
