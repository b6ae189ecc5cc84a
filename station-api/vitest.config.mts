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
    // each file gets its own temporary SQLite database; files run in parallel forks
    pool: 'forks',
  },
  plugins: [
    // Nest needs decorator metadata, which Vite's default transform does not emit
    swc.vite({ module: { type: 'es6' } }),
  ],
});
