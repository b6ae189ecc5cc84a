import { ChildProcess, execFileSync, spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { ReadlineParser } from '@serialport/parser-readline';
import { SerialPort } from 'serialport';
import { io, Socket } from 'socket.io-client';
import { checkAfterRestart, query, type MeasurementSnapshot, type Seen } from './crash-checks';

/*
 * The crash harness: the built station server as a child process on a temporary database, three stations
 * testing with realistic fixture timing (station 3 on the standalone simulator over a pseudo-terminal pair),
 * killed with SIGKILL at random moments and restarted. After every restart it checks what a plant relies on:
 * no run left running, every cut-off run closed with its reason and counted as an attempt, no unit passed by
 * an incomplete run, every measurement announced before the kill still stored unchanged, the pty fixture
 * switched off and read back off, and every station able to start again.
 */

// src/bench and dist/bench both sit three levels below the repository root
const repo = resolve(__dirname, '..', '..', '..');
const apiDist = join(repo, 'station-api', 'dist');
const fixtureCli = join(repo, 'mock-fixture', 'dist', 'cli.js');
/** 32+ bytes, as the server requires outside demo mode */
const SECRET = 'crash-harness-secret-0123456789abcdef';

export interface CrashHarnessOptions {
  kills: number;
  /** Seed of the kill-moment generator, so a failing sequence can be replayed */
  seed?: number;
  log?: (line: string) => void;
}

export interface CrashHarnessReport {
  kills: number;
  runsStarted: number;
  runsFinished: number;
  runsInterrupted: number;
  measurementsChecked: number;
  ptyLeftPowered: number;
  ptyCheckedOff: number;
  restartMs: number[];
  problems: string[];
}

function prng(seed: number): () => number {
  // mulberry32: small, seedable, good enough to pick kill moments
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const srv = createServer();
    srv.on('error', fail);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      srv.close(() => (addr && typeof addr === 'object' ? done(addr.port) : fail(new Error('no port'))));
    });
  });
}

async function waitFor(check: () => boolean | Promise<boolean>, what: string, timeoutMs = 20_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await check()) return;
    await sleep(50);
  }
  throw new Error(`timed out waiting for ${what}`);
}

/** Asks the fixture on the other end of the pty for its source and load state (the server must be down). */
async function readFixtureState(path: string): Promise<{ sourceOn: boolean; loadOn: boolean }> {
  const port = new SerialPort({ path, baudRate: 115200, autoOpen: false });
  await new Promise<void>((done, fail) => port.open((err) => (err ? fail(err) : done())));
  const parser = port.pipe(new ReadlineParser({ delimiter: '\n' }));
  const lines: string[] = [];
  parser.on('data', (l: string) => lines.push(l.trim()));
  const ask = async (cmd: string) => {
    const before = lines.length;
    port.write(`${cmd}\n`);
    await waitFor(() => lines.length > before, `a reply to ${cmd}`, 5_000);
    return lines[lines.length - 1];
  };
  try {
    const source = await ask('OUTP?');
    const load = await ask('LOAD?');
    return { sourceOn: source === '1', loadOn: load === '1' };
  } finally {
    await new Promise<void>((done) => port.close(() => done()));
  }
}

class ServerProcess {
  child?: ChildProcess;
  out = '';
  constructor(
    private readonly env: NodeJS.ProcessEnv,
    readonly port: number,
  ) {}

  get baseUrl(): string {
    return `http://127.0.0.1:${this.port}`;
  }

  async start(): Promise<number> {
    const t0 = Date.now();
    this.out = '';
    const child = spawn(process.execPath, [join(apiDist, 'main.js')], { cwd: repo, env: { ...this.env, PORT: String(this.port) }, stdio: ['ignore', 'pipe', 'pipe'] });
    this.child = child;
    child.stdout!.on('data', (d) => (this.out += d));
    child.stderr!.on('data', (d) => (this.out += d));
    await waitFor(async () => {
      if (child.exitCode !== null || child.signalCode !== null) throw new Error(`server exited while starting:\n${this.out}`);
      try {
        return (await fetch(`${this.baseUrl}/api/docs/openapi.json`, { signal: AbortSignal.timeout(2_000) })).ok;
      } catch {
        return false;
      }
    }, 'the station server to answer', 60_000);
    return Date.now() - t0;
  }

  async kill(signal: NodeJS.Signals): Promise<void> {
    const child = this.child;
    if (!child || child.exitCode !== null || child.signalCode !== null) return;
    const gone = new Promise((r) => child.once('exit', r));
    child.kill(signal);
    await gone;
  }
}

async function api<T>(server: ServerProcess, token: string, method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
  const res = await fetch(`${server.baseUrl}${path}`, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body ? { 'content-type': 'application/json' } : {}) },
    body: body ? JSON.stringify(body) : undefined,
    signal: AbortSignal.timeout(10_000),
  });
  const text = await res.text();
  return { status: res.status, body: (text ? JSON.parse(text) : null) as T };
}

async function login(server: ServerProcess, username: string): Promise<string> {
  const res = await fetch(`${server.baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ username, password: `${username}-demo` }),
  });
  if (res.status !== 200) throw new Error(`login as ${username}: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

/** Runs the harness; returns the figures and every broken promise found (empty when all held). */
export async function runCrashHarness(opts: CrashHarnessOptions): Promise<CrashHarnessReport> {
  const log = opts.log ?? (() => undefined);
  const random = prng(opts.seed ?? 20261202);
  const report: CrashHarnessReport = {
    kills: 0,
    runsStarted: 0,
    runsFinished: 0,
    runsInterrupted: 0,
    measurementsChecked: 0,
    ptyLeftPowered: 0,
    ptyCheckedOff: 0,
    restartMs: [],
    problems: [],
  };
  const problem = (text: string) => {
    report.problems.push(text);
    log(`PROBLEM ${text}`);
  };

  const dir = mkdtempSync(join(tmpdir(), 'railwright-crash-'));
  const dbPath = join(dir, 'crash.sqlite');
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_PATH: dbPath,
    JWT_SECRET: SECRET,
    SEED_HISTORY: '0',
    FIXTURE_SIM_TIMING: 'realistic',
    FIXTURE_SIM_CONFIG: '',
    UI_DIST: '',
    HOST: '127.0.0.1',
    LOG_LEVEL: 'error',
    LOGIN_ATTEMPTS_PER_MINUTE: '100000',
  };
  let socat: ChildProcess | undefined;
  let fixture: ChildProcess | undefined;
  const server = new ServerProcess(env, await freePort());
  const sockets: Socket[] = [];
  try {
    execFileSync(process.execPath, [join(apiDist, 'database', 'seed-cli.js')], { cwd: repo, env, stdio: 'pipe' });

    // the pty pair: /dev/pts paths, as a USB-serial fixture would have a /dev/tty path
    let socatErr = '';
    socat = spawn('socat', ['-d', '-d', 'pty,raw,echo=0', 'pty,raw,echo=0'], { stdio: ['ignore', 'ignore', 'pipe'] });
    socat.stderr!.on('data', (d) => (socatErr += d));
    await waitFor(() => (socatErr.match(/PTY is (\S+)/g) ?? []).length >= 2, `socat's pty pair (${socatErr})`);
    const [stationSide, fixtureSide] = [...socatErr.matchAll(/PTY is (\S+)/g)].map((m) => m[1]);
    const noDefects = join(dir, 'no-defects.json');
    writeFileSync(noDefects, JSON.stringify({ defectRates: {} }));
    let fixtureLog = '';
    fixture = spawn(
      process.execPath,
      [fixtureCli, '--path', fixtureSide, '--product', 'OB-BK1202', '--timing', 'realistic', '--fixture-id', 'FX-103', '--config', noDefects],
      { stdio: ['ignore', 'ignore', 'pipe'] },
    );
    fixture.stderr!.on('data', (d) => (fixtureLog += d));
    await waitFor(() => fixtureLog.includes('serving'), `the standalone fixture (${fixtureLog})`);

    // first start: point station EOL-3's fixture at the pty
    report.restartMs.push(await server.start());
    const engineer = await login(server, 'engineer');
    const [fx] = await query<{ id: number }>(dbPath, "select id from fixtures where code = 'FX-103'");
    const patched = await api(server, engineer, 'PATCH', `/api/fixtures/${fx.id}`, { portPath: stationSide, baudRate: 115200 });
    if (patched.status !== 200) throw new Error(`could not point FX-103 at ${stationSide}: ${patched.status} ${JSON.stringify(patched.body)}`);
    const stations = await query<{ id: number; code: string; lot: number }>(dbPath, 'select id, code, active_lot_id as lot from stations order by id');

    const seen = new Map<number, Seen>();
    const announced = new Map<number, MeasurementSnapshot>();
    const usedSerials = new Set<string>();

    const nextSerial = async (lotId: number): Promise<string | undefined> => {
      const rows = await query<{ serial: string }>(dbPath, "select serial from units where lot_id = ? and state = 'untested' order by id", [lotId]);
      const s = rows.find((r) => !usedSerials.has(r.serial))?.serial;
      if (s) usedSerials.add(s);
      return s;
    };

    for (let cycle = 0; cycle <= opts.kills; cycle++) {
      if (cycle > 0) {
        // the server is down: what did the kill leave on the pty fixture?
        const left = await readFixtureState(stationSide);
        if (left.sourceOn || left.loadOn) report.ptyLeftPowered++;
        report.restartMs.push(await server.start());
        await checkAfterRestart(dbPath, seen, announced, report, problem);
        if (cycle % 5 === 0 || cycle === opts.kills) {
          // start-up alone must switch the fixture off and confirm it: restart with no run and look again
          await server.kill('SIGKILL');
          const after = await readFixtureState(stationSide);
          if (after.sourceOn || after.loadOn) problem(`cycle ${cycle}: the pty fixture was still on after a start-up (source ${after.sourceOn}, load ${after.loadOn})`);
          else report.ptyCheckedOff++;
          report.restartMs.push(await server.start());
        }
        if (cycle === opts.kills) break;
      }
      for (const s of sockets.splice(0)) s.close();
      const operator = await login(server, 'operator');
      const socket = io(server.baseUrl, { auth: { token: operator }, transports: ['websocket'], reconnection: false });
      sockets.push(socket);
      socket.on('measurement:judged', (p: { measurement: MeasurementSnapshot & { runId: number } }) => {
        const m = p.measurement;
        announced.set(m.id, { id: m.id, runId: m.runId, quantity: m.quantity, value: m.value, verdict: m.verdict, lowLimit: m.lowLimit, highLimit: m.highLimit });
      });
      socket.on('run:finished', (p: { runId: number }) => {
        const r = seen.get(p.runId);
        if (r) r.finished = true;
        report.runsFinished++;
      });
      await waitFor(() => socket.connected, 'the socket to connect', 10_000);
      for (const st of stations) {
        const ack = (await socket.timeout(5_000).emitWithAck('station:join', { stationId: st.id })) as { ok: boolean; message?: string };
        if (!ack.ok) problem(`cycle ${cycle}: could not join station ${st.code}: ${ack.message}`);
      }

      // every station starts a unit, and the next one as soon as it is free, until the kill
      // a kill anywhere from just after the starts to a few steps into the next units
      const killAt = Date.now() + 300 + random() * 4_000;
      const busy = new Map<number, number>();
      let startedThisCycle = 0;
      while (Date.now() < killAt) {
        for (const st of stations) {
          const current = busy.get(st.id);
          if (current !== undefined && !seen.get(current)?.finished) continue;
          const serial = await nextSerial(st.lot);
          if (!serial) continue;
          const res = await api<{ run?: { id: number }; id?: number; message?: string }>(server, operator, 'POST', `/api/stations/${st.id}/runs`, { serial, safetyConfirmed: true });
          if (res.status === 201) {
            const runId = res.body.run?.id ?? res.body.id!;
            seen.set(runId, { runId, stationId: st.id, finished: false });
            busy.set(st.id, runId);
            report.runsStarted++;
            startedThisCycle++;
          } else if (res.status !== 409) {
            problem(`cycle ${cycle}: station ${st.code} could not start ${serial}: ${res.status} ${JSON.stringify(res.body)}`);
          }
        }
        await sleep(100);
      }
      if (cycle > 0 && startedThisCycle < stations.length) problem(`cycle ${cycle}: only ${startedThisCycle} of ${stations.length} stations started a run after the restart`);
      await server.kill('SIGKILL');
      report.kills++;
      log(`kill ${report.kills}: ${startedThisCycle} runs started this cycle, ${announced.size} measurements announced so far`);
    }
    await server.kill('SIGTERM');
    const afterStop = await readFixtureState(stationSide);
    if (afterStop.sourceOn || afterStop.loadOn) problem('the pty fixture was left on after a clean shutdown');
  } finally {
    for (const s of sockets) s.close();
    await server.kill('SIGKILL');
    fixture?.kill('SIGTERM');
    socat?.kill('SIGTERM');
    rmSync(dir, { recursive: true, force: true });
  }
  return report;
}
