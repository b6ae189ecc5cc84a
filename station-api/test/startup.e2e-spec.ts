import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const API = resolve(__dirname, '..');
const SECRET = 'startup-test-secret-0123456789-abcdefgh';

interface Exit {
  code: number | null;
  output: string;
  ms: number;
}

function freePort(): Promise<number> {
  return new Promise((res, rej) => {
    const srv = createServer();
    srv.on('error', rej);
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => res(port));
    });
  });
}

/**
 * Starts the real server (src/main.ts, compiled on the fly by test/support/swc-register.cjs) with a clean
 * environment. Resolves when it exits, or when `until` sees its output and has been called back.
 */
function startServer(env: Record<string, string>, until?: (output: string) => boolean, onReady?: () => Promise<void>): Promise<Exit> {
  const started = Date.now();
  const clean = Object.fromEntries(Object.entries(process.env).filter(([k]) => !/^(JWT_|DATABASE_PATH|RAILWRIGHT_|HOST|PORT|UI_DIST|NODE_ENV)/.test(k)));
  const child = spawn(process.execPath, ['-r', './test/support/swc-register.cjs', 'src/main.ts'], {
    cwd: API,
    env: { ...clean, LOG_LEVEL: 'log', FIXTURE_SIM_TIMING: 'instant', ...env } as NodeJS.ProcessEnv,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  let readyCalled = false;
  const hardStop = setTimeout(() => child.kill('SIGKILL'), 90_000);
  return new Promise((res) => {
    const seen = (d: Buffer) => {
      output += d.toString();
      if (until && !readyCalled && until(output)) {
        readyCalled = true;
        void (onReady ?? (async () => undefined))().finally(() => child.kill('SIGTERM'));
      }
    };
    child.stdout.on('data', seen);
    child.stderr.on('data', seen);
    child.on('exit', (code) => {
      clearTimeout(hardStop);
      res({ code, output, ms: Date.now() - started });
    });
  });
}

describe('server start-up', () => {
  const dirs: string[] = [];
  const tmp = () => {
    const d = mkdtempSync(join(tmpdir(), 'railwright-start-'));
    dirs.push(d);
    return d;
  };
  afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

  it('refuses to start in production without JWT_SECRET, in one line, and never listens', async () => {
    const r = await startServer({ NODE_ENV: 'production', DATABASE_PATH: join(tmp(), 'db.sqlite'), PORT: String(await freePort()) });
    expect(r.code).toBe(1);
    expect(r.output.trim()).toBe(
      'JWT_SECRET is not set: the server will not sign tokens with a known value. Set JWT_SECRET to at least 32 random bytes (openssl rand -hex 32), or start the demo with npm start.',
    );
  });

  it('refuses a secret shorter than 32 bytes and a token lifetime that would never end', async () => {
    const r = await startServer({ JWT_SECRET: 'short-secret-16+', JWT_EXPIRES_IN: '99999999999999999999d', DATABASE_PATH: join(tmp(), 'db.sqlite') });
    expect(r.code).toBe(1);
    expect(r.output).toMatch(/JWT_SECRET must be at least 32 bytes/);
    expect(r.output).toMatch(/JWT_EXPIRES_IN must be between 1 second and 7 days/);
  });

  it('stops within seconds, naming the path and the reason, when the database cannot be created or written', async () => {
    const d = tmp();
    writeFileSync(join(d, 'not-a-folder'), 'x');
    const blocked = await startServer({ JWT_SECRET: SECRET, DATABASE_PATH: join(d, 'not-a-folder', 'db.sqlite') });
    expect(blocked.code).toBe(1);
    expect(blocked.output).toContain(`DATABASE_PATH: the folder "${join(d, 'not-a-folder')}" cannot be created`);
    expect(blocked.ms).toBeLessThan(15_000);
    const proc = await startServer({ JWT_SECRET: SECRET, DATABASE_PATH: '/proc/railwright/db.sqlite' });
    expect(proc.code).toBe(1);
    expect(proc.output).toMatch(/DATABASE_PATH: "\/proc\/railwright\/db.sqlite" is under \/proc/);
    expect(proc.ms).toBeLessThan(15_000);
  });

  it('migrates a fresh database path itself before answering, and keeps a demo secret in the data folder', async () => {
    const d = join(tmp(), 'new', 'folder');
    const ui = tmp();
    writeFileSync(join(ui, 'index.html'), '<!doctype html><title>station ui</title>');
    const port = await freePort();
    let login = 0;
    const seen: Record<string, number | string> = {};
    const r = await startServer(
      { RAILWRIGHT_DEMO: '1', DATABASE_PATH: join(d, 'db.sqlite'), PORT: String(port), UI_DIST: ui },
      // the server's own line: in demo mode the mail capture logs "listening on" before the HTTP port is open
      (out) => out.includes('station server listening on'),
      async () => {
        // an unmigrated database answered 500 here; a migrated, empty one refuses the sign-in
        const res = await fetch(`http://127.0.0.1:${port}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: 'nobody', password: 'wrong-pass' }) });
        login = res.status;
        // with the UI served, bad bodies used to answer 404 "Cannot POST"
        const post = (body: string) => fetch(`http://127.0.0.1:${port}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body });
        seen.invalid = (await post('{"username": ')).status;
        seen.tooBig = (await post(JSON.stringify({ username: 'x'.repeat(200_000) }))).status;
        seen.unknownApi = (await fetch(`http://127.0.0.1:${port}/api/nothing-here`)).status;
        seen.ui = await (await fetch(`http://127.0.0.1:${port}/stations/1`)).text();
      },
    );
    expect(login).toBe(401);
    expect(seen).toMatchObject({ invalid: 400, tooBig: 413, unknownApi: 404, ui: expect.stringContaining('station ui') });
    expect(r.output).toMatch(/Applied \d+ database migration/);
    expect(r.output).toMatch(/Only this computer can reach the server \(HOST=127.0.0.1\)/);
    const secretFile = join(d, 'jwt-secret');
    expect(existsSync(secretFile)).toBe(true);
    expect(readFileSync(secretFile, 'utf8').trim().length).toBeGreaterThanOrEqual(32);
    // owner read/write only
    expect(statSync(secretFile).mode & 0o077).toBe(0);
  }, 120_000);
});
