#!/usr/bin/env node
/*
 * The UI's REST types come from the server's own OpenAPI document, never from hand-written copies.
 *
 *   node scripts/api-types.mjs          writes src/lib/api-types.ts        (npm run gen:api-types -w station-ui)
 *   node scripts/api-types.mjs --check  fails when the checked-in file differs from a fresh generation
 *                                       (npm run check:api-types -w station-ui)
 *
 * Steps: build station-api (and mock-fixture when its dist is missing), write the document with
 * station-api/scripts/write-openapi.cjs (no server, a throw-away SQLite file), then openapi-typescript.
 * `--no-build` skips the builds when station-api/dist is known to be fresh.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const ui = resolve(here, '..');
const root = resolve(ui, '..');
const target = join(ui, 'src', 'lib', 'api-types.ts');
const check = process.argv.includes('--check');
const build = !process.argv.includes('--no-build');

const HEADER = `/*
 * GENERATED from the station server's OpenAPI document (station-api DTOs and controllers) by
 * station-ui/scripts/api-types.mjs with openapi-typescript. Do not edit by hand: change the server's DTO,
 * then run \`npm run gen:api-types -w station-ui\`. \`npm run check:api-types -w station-ui\` fails on drift.
 * Friendly names for the screens: src/lib/api-schema.ts.
 */
`;

const run = (cmd, args) => execFileSync(cmd, args, { cwd: root, stdio: ['ignore', 'ignore', 'inherit'] });

function generate() {
  if (build) {
    if (!existsSync(join(root, 'mock-fixture', 'dist', 'index.js'))) run('npm', ['run', 'build', '-w', 'mock-fixture']);
    run('npm', ['run', 'build', '-w', 'station-api']);
  }
  const dir = mkdtempSync(join(tmpdir(), 'railwright-api-types-'));
  try {
    const json = join(dir, 'openapi.json');
    const ts = join(dir, 'api-types.ts');
    run('node', [join(root, 'station-api', 'scripts', 'write-openapi.cjs'), json]);
    const bin = join(root, 'node_modules', 'openapi-typescript', 'bin', 'cli.js');
    run('node', [bin, json, '--output', ts, '--alphabetize', '--empty-objects-unknown']);
    return HEADER + readFileSync(ts, 'utf8');
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const fresh = generate();
if (check) {
  const current = existsSync(target) ? readFileSync(target, 'utf8') : '';
  if (current !== fresh) {
    console.error(
      'station-ui/src/lib/api-types.ts is out of date with the server\'s OpenAPI document.\n' +
        'Run `npm run gen:api-types -w station-ui` and commit the result.',
    );
    process.exit(1);
  }
  console.log('api-types.ts matches the server\'s OpenAPI document.');
} else {
  writeFileSync(target, fresh);
  console.log(`wrote ${target}`);
}
