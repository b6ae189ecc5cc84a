// npm test: every test of every workspace. Gets what the tests need first (node modules, Debian's
// chromium and socat), builds, then runs the suites and prints one closing tally.
import { spawnSync } from 'node:child_process';
import { TEST_PACKAGES } from './ensure-deps.mjs';
import { buildAll, ensureDebianPackages, ensureNodeModules, log, root } from './lib.mjs';

ensureNodeModules();
ensureDebianPackages(TEST_PACKAGES);
buildAll();

const suites = [
  ['mock-fixture', ['npm', 'test', '-w', 'mock-fixture']],
  ['station-api', ['npm', 'test', '-w', 'station-api']],
  ['station-ui (unit)', ['npm', 'test', '-w', 'station-ui']],
  ['station-ui (browser)', ['npm', 'run', 'test:browser', '-w', 'station-ui']],
];

let passed = 0;
let failed = 0;
const failedSuites = [];
for (const [name, [cmd, ...args]] of suites) {
  log(`Running ${name} tests...`);
  const res = spawnSync(cmd, args, { cwd: root, encoding: 'utf8', env: { ...process.env, FORCE_COLOR: '1' } });
  process.stdout.write(res.stdout ?? '');
  process.stderr.write(res.stderr ?? '');
  // Vitest's summary line, e.g. "Tests  12 passed | 1 failed (13)"
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
