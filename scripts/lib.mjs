// Shared helpers for the root commands (start, test, dev). Plain Node, no dependencies:
// these scripts run before node_modules exists.
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = join(dirname(fileURLToPath(import.meta.url)), '..');

export function log(msg) {
  process.stdout.write(`\x1b[1m[railwright]\x1b[0m ${msg}\n`);
}

/** Runs a command in the foreground; exits the process with its code on failure. */
export function run(cmd, args, opts = {}) {
  const res = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...opts });
  if (res.status !== 0) {
    log(`"${cmd} ${args.join(' ')}" failed (exit ${res.status ?? res.signal}).`);
    process.exit(res.status ?? 1);
  }
}

export function has(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
}

/** `npm ci` when node_modules is missing or was installed from another package-lock.json. */
export function ensureNodeModules() {
  const stamp = join(root, 'node_modules', '.railwright-lock-hash');
  const hash = createHash('sha256').update(readFileSync(join(root, 'package-lock.json'))).digest('hex');
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === hash) return;
  log('Installing node modules (npm ci; about two minutes on a clean machine)...');
  run('npm', ['ci', '--no-audit', '--no-fund']);
  writeFileSync(stamp, hash);
}

/**
 * Debian packages the tests need. Installed with apt-get when running as root; otherwise
 * stops with the command to run. Never downloads a browser build of its own.
 */
export function ensureDebianPackages(packages) {
  const missing = packages.filter((p) => !has(p.bin));
  if (missing.length === 0) return;
  const names = missing.map((p) => p.pkg).join(' ');
  if (process.getuid?.() !== 0) {
    log(`Missing Debian package(s): ${names}. Install them with: sudo apt-get install -y ${names}`);
    process.exit(1);
  }
  log(`Installing Debian package(s): ${names}`);
  run('apt-get', ['update', '-qq']);
  run('apt-get', ['install', '-y', '-qq', ...missing.map((p) => p.pkg)], {
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
}

export function buildAll() {
  log('Building mock-fixture, station-api and station-ui...');
  run('npm', ['run', 'build', '-w', 'mock-fixture']);
  run('npm', ['run', 'build', '-w', 'station-api']);
  run('npm', ['run', 'build', '-w', 'station-ui']);
}

export { spawn };
