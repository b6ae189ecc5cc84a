import swc from 'unplugin-swc';
import { defineConfig } from 'vitest/config';

export default defineConfig({
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
