import react from '@vitejs/plugin-react';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

/** Unit tests in jsdom. The real-browser tests have their own config (vitest.e2e.config.ts). */
export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      // pure modules the server and the screens share (value formatting); see station-api/src/contract
      '@contract': fileURLToPath(new URL('../station-api/src/contract', import.meta.url)),
    },
  },
  test: {
    environment: 'jsdom',
    include: ['src/**/*.test.{ts,tsx}'],
    setupFiles: ['./src/testing/setup.ts'],
    restoreMocks: true,
    // npm test runs these beside the type-check on 2 cores; a render can take seconds then
    testTimeout: 20_000,
  },
});
