// npm test: every test of every workspace. Gets what the tests need first (node modules, Debian's
// chromium and socat), builds, then runs the suites and prints one closing tally.
import { spawnSync } from 'node:child_process';
import { TEST_PACKAGES } from './ensure-deps.mjs';
import { buildAll, ensureDebianPackages, ensureNodeModules, log, root } from './lib.mjs';

ensureNodeModules();
ensureDebianPackages(TEST_PACKAGES);
buildAll();

// Checks that keep the code's shape (each counts as one test): types of every workspace with its tests,
// lint, dependency boundaries, and the UI's REST types against the server's OpenAPI document.
const checks = [
  ['type-check (every workspace, tests included)', ['npm', 'run', 'typecheck']],
  ['lint (typescript-eslint recommended)', ['npm', 'run', 'lint']],
  ['dependency boundaries', ['npm', 'run', 'check:boundaries']],
  ['UI REST types match the OpenAPI document', ['node', 'station-ui/scripts/api-types.mjs', '--check', '--no-build']],
];

const suites = [
  ['mock-fixture', ['npm', 'test', '-w', 'mock-fixture']],
  ['station-api', ['npm', 'test', '-w', 'station-api']],
  // alone, so its server restarts do not compete with the other suites for the cores
  ['station-api (crash harness)', ['npm', 'run', 'test:crash', '-w', 'station-api']],
  ['station-ui (unit)', ['npm', 'test', '-w', 'station-ui']],
  ['station-ui (browser)', ['npm', 'run', 'test:browser', '-w', 'station-ui']],
];

let passed = 0;
let failed = 0;
const failedSuites = [];
for (const [name, [cmd, ...args]] of checks) {
  log(`Checking ${name}...`);
  const res = spawnSync(cmd, args, { cwd: root, encoding: 'utf8', env: { ...process.env, FORCE_COLOR: '1' } });
  if (res.status === 0) {
    passed += 1;
  } else {
    process.stdout.write(res.stdout ?? '');
    process.stderr.write(res.stderr ?? '');
    failed += 1;
    failedSuites.push(name);
  }
}
for (const [name, [cmd, ...args]] of suites) {
  log(`Running ${name} tests...`);
  const res = spawnSync(cmd, args, { cwd: root, encoding: 'utf8', env: { ...process.env, FORCE_COLOR: '1' } });
  process.stdout.write(res.stdout ?? '');
  process.stderr.write(res.stderr ?? '');
  // Vitest's summary line, e.g. "Tests  12 passed | 1 failed (13)"
  // eslint-disable-next-line no-control-regex -- strips the ANSI colour codes Vitest prints
  const plain = (res.stdout ?? '').replace(/\x1b\[[0-9;]*m/g, '');
  const line = plain.split('\n').find((l) => /^\s*Tests\s+/.test(l)) ?? '';
  const p = Number(/(\d+) passed/.exec(line)?.[1] ?? 0);
  const f = Number(/(\d+) failed/.exec(line)?.[1] ?? 0);
  passed += p;
  failed += f;
  if (res.status !== 0) {
    failedSuites.push(name);
    if (f === 0) failed += 1; // a suite that crashed before reporting counts as one failure
  }
}

if (failedSuites.length) log(`Failing suites: ${failedSuites.join(', ')}`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failedSuites.length ? 1 : 0);
