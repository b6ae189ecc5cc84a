import { spawn, type ChildProcess } from 'node:child_process';
import { copyFile, mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { inject } from 'vitest';
import { assertBuilt, repo } from './repo';

export interface StationServer {
  /** e.g. http://127.0.0.1:41234 */
  baseUrl: string;
  port: number;
  /** Temp folder holding the database */
  dir: string;
  /** Everything the server printed so far, for failure messages */
  output: () => string;
  stop: () => Promise<void>;
}

/** Server start on 2 cores with a fresh database: a few seconds; 60 s means something is wrong. */
const READY_TIMEOUT_MS = 60_000;
/** Grace period after SIGTERM for the server to put fixtures in a safe state and close the database. */
const STOP_GRACE_MS = 5_000;

export const E2E_JWT_SECRET = 'e2e-secret-0123456789-at-least-32-bytes';

/** Asks the OS for a port nobody uses (port 0), then frees it for the server. */
export function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      srv.close(() => (addr && typeof addr === 'object' ? resolvePort(addr.port) : reject(new Error('no port'))));
    });
  });
}

export function baseEnv(dbPath: string): NodeJS.ProcessEnv {
  return {
    ...process.env,
    DATABASE_PATH: dbPath,
    SEED_HISTORY: '0',
    UI_DIST: repo.uiDist,
    FIXTURE_SIM_TIMING: 'instant',
    JWT_SECRET: E2E_JWT_SECRET,
    LOG_LEVEL: process.env.E2E_LOG_LEVEL ?? 'warn',
  };
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv): Promise<string> {
  return new Promise((resolveRun, reject) => {
    const child = spawn(cmd, args, { cwd: repo.root, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (out += d));
    child.on('error', reject);
    child.on('exit', (code, signal) =>
      code === 0 ? resolveRun(out) : reject(new Error(`${args.join(' ')} exited with ${code ?? signal}:\n${out}`)),
    );
  });
}

function exited(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((r) => child.once('exit', () => r()));
}

async function waitUntilReady(url: string, child: ChildProcess, output: () => string): Promise<void> {
  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null) {
      throw new Error(`The station server stopped before it was ready (exit ${child.exitCode ?? child.signalCode}):\n${output()}`);
    }
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(2_000) });
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`The station server did not answer ${url} within ${READY_TIMEOUT_MS / 1000} s:\n${output()}`);
}

/** Migrates and seeds the database at `env.DATABASE_PATH` with the built seed command (`npm run db:seed`). */
export async function seedDatabase(env: NodeJS.ProcessEnv): Promise<void> {
  await run(process.execPath, [resolve(repo.apiDist, 'database/seed-cli.js')], env);
}

/**
 * Keys the seed command reads besides the database path: a server started with another value of one of
 * these seeds its own database instead of copying the template (see template-database.ts).
 */
const SEED_INPUTS = ['SEED_HISTORY'] as const;

/**
 * Seeds a fresh database in a temp folder and starts the built station server on a free port with
 * the simulated fixture at instant timing. Call `stop()` in afterAll.
 * The fresh database is a copy of the template the globalSetup seeded once for the whole run (the same
 * seed command, the same environment), or seeded here when there is none or `extraEnv` changes the seed.
 */
export async function startStationServer(extraEnv: NodeJS.ProcessEnv = {}): Promise<StationServer> {
  assertBuilt();
  const dir = await mkdtemp(join(tmpdir(), 'railwright-e2e-'));
  const dbPath = join(dir, 'e2e.sqlite');
  const env = { ...baseEnv(dbPath), ...extraEnv };

  // absent when the tests run without the config's globalSetup
  const template = inject('templateDatabasePath') as string | undefined;
  const sameSeed = SEED_INPUTS.every((key) => extraEnv[key] === undefined || extraEnv[key] === baseEnv(dbPath)[key]);
  try {
    if (template && sameSeed) await copyFile(template, dbPath);
    else await seedDatabase(env);
  } catch (e) {
    await rm(dir, { recursive: true, force: true });
    throw new Error(`Seeding the e2e database failed. ${(e as Error).message}`, { cause: e });
  }

  const port = await freePort();
  let out = '';
  const child = spawn(process.execPath, [resolve(repo.apiDist, 'main.js')], {
    cwd: repo.root,
    env: { ...env, PORT: String(port), HOST: '127.0.0.1' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (d) => (out += d));
  child.stderr?.on('data', (d) => (out += d));
  const output = () => out;

  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), STOP_GRACE_MS);
      await exited(child);
      clearTimeout(timer);
    }
    await rm(dir, { recursive: true, force: true });
  };

  const baseUrl = `http://127.0.0.1:${port}`;
  try {
    await waitUntilReady(`${baseUrl}/api/docs/openapi.json`, child, output);
  } catch (e) {
    await stop();
    throw e;
  }
  return { baseUrl, port, dir, output, stop };
}
