import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));

/** Absolute paths the browser tests rely on. */
export const repo = {
  root: resolve(here, '../../..'),
  apiDist: resolve(here, '../../../station-api/dist'),
  uiDist: resolve(here, '../../dist'),
  screenshots: resolve(here, '../../../docs/screenshots'),
} as const;

/**
 * The tests run against built output, never sources: stop at once with the command that fixes it
 * instead of timing out later.
 */
export function assertBuilt(): void {
  const missing: string[] = [];
  const need: [string, string][] = [
    [resolve(repo.apiDist, 'main.js'), 'npm run build -w station-api'],
    [resolve(repo.apiDist, 'database/seed-cli.js'), 'npm run build -w station-api'],
    [resolve(repo.uiDist, 'index.html'), 'npm run build -w station-ui'],
  ];
  for (const [file, fix] of need) if (!existsSync(file)) missing.push(`  ${file}  → run \`${fix}\``);
  if (missing.length > 0) {
    throw new Error(`The browser tests need the built server and UI. Missing:\n${missing.join('\n')}\n(or \`npm run build\` at the repo root)`);
  }
}
