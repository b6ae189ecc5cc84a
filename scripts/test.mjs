// npm test: every test of every workspace. Gets what the tests need first (node modules, Debian's
// chromium and socat), builds, then runs the suites and prints one closing tally.
import { spawn } from 'node:child_process';
import { TEST_PACKAGES } from './ensure-deps.mjs';
import { buildAll, ensureDebianPackages, ensureNodeModules, log, root } from './lib.mjs';

ensureNodeModules();
ensureDebianPackages(TEST_PACKAGES);
buildAll();

/**
 * A job: `kind` 'check' counts as one test (passes or fails as a whole); 'suite' is a Vitest run whose
 * summary line gives the counts.
 */
const check = (name, cmd) => ({ kind: 'check', name, cmd });
const suite = (name, cmd) => ({ kind: 'suite', name, cmd });

// Stage 1, two at a time (the machine has 2 cores): the crash harness, checks that keep the code's shape
// (types of every workspace with its tests, lint, dependency boundaries, the UI's REST types against the
// server's OpenAPI document) and the light suites. Their output is printed whole when each ends, so nothing
// interleaves. The longest jobs first, so the two lanes end together.
// The crash harness restarts one built server at a time and waits for it; it leaves a core free, which the
// other lane's single-process checks and one-worker UI suite fill. Its checks are about what a crash leaves
// behind, never about timing (its waits are generous), so sharing the machine slows it without making it
// flaky; docs/testing.md has the loaded runs that show it. Never beside a server suite: those use both cores.
const stage1 = [
  suite('station-ui (unit)', ['npm', 'test', '-w', 'station-ui']),
  suite('station-api (crash harness)', ['npm', 'run', 'test:crash', '-w', 'station-api']),
  check('type-check (every workspace, tests included)', ['npm', 'run', 'typecheck']),
  check('lint (typescript-eslint recommended)', ['npm', 'run', 'lint']),
  suite('mock-fixture', ['npm', 'test', '-w', 'mock-fixture']),
  check('dependency boundaries', ['npm', 'run', 'check:boundaries']),
  check('UI REST types match the OpenAPI document', ['node', 'station-ui/scripts/api-types.mjs', '--check', '--no-build']),
];
// Then the server suites one after another: each runs two workers (or a server and Chromium) and would
// compete for the cores.
const heavy = [
  suite('station-api', ['npm', 'test', '-w', 'station-api']),
  suite('station-ui (browser)', ['npm', 'run', 'test:browser', '-w', 'station-ui']),
];

function runJob(job) {
  return new Promise((resolvePromise) => {
    const started = Date.now();
    const [cmd, ...args] = job.cmd;
    const child = spawn(cmd, args, { cwd: root, env: { ...process.env, FORCE_COLOR: '1' } });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    child.on('close', (status) => resolvePromise({ job, status, stdout, stderr, seconds: (Date.now() - started) / 1000 }));
  });
}

let passed = 0;
let failed = 0;
const failedJobs = [];
const timings = [];

function account({ job, status, stdout, stderr, seconds }) {
  timings.push(`${job.name}: ${seconds.toFixed(0)} s`);
  if (job.kind === 'check') {
    if (status === 0) {
      passed += 1;
    } else {
      process.stdout.write(stdout);
      process.stderr.write(stderr);
      failed += 1;
      failedJobs.push(job.name);
    }
    return;
  }
  process.stdout.write(stdout);
  process.stderr.write(stderr);
  // Vitest's summary line, e.g. "Tests  12 passed | 1 failed (13)"
  // eslint-disable-next-line no-control-regex -- strips the ANSI colour codes Vitest prints
  const plain = stdout.replace(/\x1b\[[0-9;]*m/g, '');
  const line = plain.split('\n').find((l) => /^\s*Tests\s+/.test(l)) ?? '';
  const p = Number(/(\d+) passed/.exec(line)?.[1] ?? 0);
  const f = Number(/(\d+) failed/.exec(line)?.[1] ?? 0);
  passed += p;
  failed += f;
  if (status !== 0) {
    failedJobs.push(job.name);
    if (f === 0) failed += 1; // a suite that crashed before reporting counts as one failure
  }
}

/** Runs `jobs` with at most `width` at once, accounting each as it ends. */
async function runPool(jobs, width) {
  const queue = [...jobs];
  const lanes = Array.from({ length: width }, async () => {
    for (let job = queue.shift(); job; job = queue.shift()) {
      log(`Running ${job.name}...`);
      account(await runJob(job));
    }
  });
  await Promise.all(lanes);
}

await runPool(stage1, 2);
for (const job of heavy) {
  log(`Running ${job.name} tests...`);
  account(await runJob(job));
}

log(`Times: ${timings.join(' · ')}`);
if (failedJobs.length) log(`Failing: ${failedJobs.join(', ')}`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failedJobs.length ? 1 : 0);
