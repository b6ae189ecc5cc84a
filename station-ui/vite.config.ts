import react from '@vitejs/plugin-react';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

// The station server listens on 3000 by default (station-api/src/config/env.validation.ts).
const apiTarget = 'http://localhost:3000';

export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      // pure modules the server and the screens share (value formatting); see station-api/src/contract
      '@contract': fileURLToPath(new URL('../station-api/src/contract', import.meta.url)),
    },
  },
  server: {
    proxy: {
      '/api': { target: apiTarget, changeOrigin: true },
      '/socket.io': { target: apiTarget, ws: true, changeOrigin: true },
    },
  },
  build: {
    // Mantine's core bundle alone is above Vite's default 500 kB warning; routes are split lazily.
    chunkSizeWarningLimit: 900,
    // dist/.vite/manifest.json: scripts/bundle-size.mjs reads which chunks each route loads
    manifest: true,
  },
});
