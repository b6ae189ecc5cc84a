// Installs what the tests need and nothing else: node modules (npm ci) and Debian's chromium and socat.
import { ensureDebianPackages, ensureNodeModules } from './lib.mjs';

export const TEST_PACKAGES = [
  { bin: 'chromium', pkg: 'chromium' },
  { bin: 'socat', pkg: 'socat' },
];

if (import.meta.url === `file://${process.argv[1]}`) {
  ensureDebianPackages(TEST_PACKAGES);
  ensureNodeModules();
}
