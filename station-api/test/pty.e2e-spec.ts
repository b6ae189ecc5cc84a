import { ChildProcess, execFileSync, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MeasurementView } from '../src/realtime/station-events';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

const repo = resolve(__dirname, '..', '..');
const cli = join(repo, 'mock-fixture', 'dist', 'cli.js');

function waitFor(check: () => boolean, what: string, timeoutMs = 10_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  return new Promise((done, fail) => {
    const tick = () => {
      if (check()) return done();
      if (Date.now() > until) return fail(new Error(`timed out waiting for ${what}`));
      setTimeout(tick, 50);
    };
    tick();
  });
}

/**
 * The real serialport binding over a pseudo-terminal pair (socat), with the standalone simulated fixture
 * (mock-fixture's CLI) on the other end: the same path a USB serial fixture takes.
 */
describe('fixture over a real pseudo-terminal', () => {
  let t: TestApp;
  let h: EngineHarness;
  let dir: string;
  let socat: ChildProcess | undefined;
  let fixture: ChildProcess | undefined;
  let fixtureLog = '';
  let appSide: string;

  beforeAll(async () => {
    try {
      execFileSync('socat', ['-V'], { stdio: 'ignore' });
    } catch {
      throw new Error('socat is not installed: apt-get install -y socat');
    }
    if (!existsSync(cli)) {
      // the standalone fixture runs from its build; build it once if nobody has yet
      execFileSync('npx', ['tsc', '-p', join(repo, 'mock-fixture', 'tsconfig.build.json')], { cwd: repo, stdio: 'inherit' });
    }
    dir = mkdtempSync(join(tmpdir(), 'railwright-pty-'));
    appSide = join(dir, 'station');
    const fixtureSide = join(dir, 'fixture');
    socat = spawn('socat', [`pty,raw,echo=0,link=${appSide}`, `pty,raw,echo=0,link=${fixtureSide}`], { stdio: 'ignore' });
    await waitFor(() => existsSync(appSide) && existsSync(fixtureSide), 'the socat pty pair');
    const config = join(dir, 'no-defects.json');
    writeFileSync(config, JSON.stringify({ defectRates: {} }));
    fixture = spawn(process.execPath, [cli, '--path', fixtureSide, '--product', 'OB-BK0503', '--timing', 'instant', '--fixture-id', 'FX-101', '--config', config], {
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    fixture.stderr!.on('data', (chunk: Buffer) => (fixtureLog += chunk.toString()));
    await waitFor(() => fixtureLog.includes('serving'), `the standalone fixture (${fixtureLog})`);

    t = await createTestApp();
    h = new EngineHarness(t, await login(t.app, 'operator'));
    // FX-101 moves from the in-process simulator to the pseudo-terminal
    await h.setFixture('FX-101', { portPath: appSide });
  });

  afterAll(async () => {
    await t?.close();
    fixture?.kill('SIGTERM');
    socat?.kill('SIGTERM');
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  // issue 8 defect 2: a server killed mid-run left the pty fixture at 12 V / 3 A; the next server must
  // switch it off and read it back off before anything else
  it('switches off and reads back off a fixture that a killed server left on, at start-up and on reconnect', async () => {
    const s = await h.station('EOL-1');
    const link = h.links.linkFor(s.fixture!);
    const leaveOn = async () => {
      await link.transport.close();
      // a second "server" opens the port, powers the unit, confirms it by query, and is killed with SIGKILL
      const script = join(dir, 'leave-on.cjs');
      writeFileSync(
        script,
        `const { SerialPort, ReadlineParser } = require(${JSON.stringify(require.resolve('serialport'))});
const port = new SerialPort({ path: ${JSON.stringify(appSide)}, baudRate: 115200 });
const lines = port.pipe(new ReadlineParser({ delimiter: '\\n' }));
const replies = [];
lines.on('data', (l) => { replies.push(l.trim()); if (replies.length === 2) console.log('powered ' + replies.join(',')); });
port.on('open', () => port.write('SOUR:VOLT 12\\nOUTP ON\\nLOAD:CURR 3\\nLOAD ON\\nOUTP?\\nLOAD?\\n'));
setInterval(() => undefined, 1000);`,
      );
      const killed = spawn(process.execPath, [script], { stdio: ['ignore', 'pipe', 'inherit'] });
      let out = '';
      killed.stdout!.on('data', (c: Buffer) => (out += c.toString()));
      await waitFor(() => out.includes('powered'), 'the other process to power the fixture');
      expect(out.trim()).toBe('powered 1,1');
      killed.kill('SIGKILL');
      await new Promise((r) => killed.once('exit', r));
    };

    // start-up: the server prepares every fixture (RunEngineService.onApplicationBootstrap → links.prepare)
    await leaveOn();
    await h.links.prepare([s.fixture!]);
    expect(h.links.faultOf(s.fixture!.id)).toBeUndefined();
    expect(await link.scpi.query('OUTP?')).toBe('0');
    expect(await link.scpi.query('LOAD?')).toBe('0');

    // reconnect: the first command on a fresh connection is preceded by the safe state and its read-back
    await leaveOn();
    const id = await link.scpi.identify();
    expect(id.fixtureId).toBe('FX-101');
    expect(await link.scpi.query('OUTP?')).toBe('0');
    expect(await link.scpi.query('LOAD?')).toBe('0');
    expect(h.links.faultOf(s.fixture!.id)).toBeUndefined();
  });

  it('identifies the fixture over the pty with the real binding', async () => {
    const s = await h.station('EOL-1');
    const link = h.links.linkFor(s.fixture!);
    expect(link.isProvided).toBe(false);
    const id = await link.scpi.identify();
    expect(id).toMatchObject({ maker: 'RAILWRIGHT', model: 'SIM-FIXTURE', fixtureId: 'FX-101' });
  });

  it('runs a good unit through every step over the pty', async () => {
    const s = await h.station('EOL-1');
    const serial = (await h.freshSerials('EOL-1', 1))[0];
    const r = await h.run(s.id, serial);
    expect(r.errorMessage).toBeUndefined();
    expect(r.verdict).toBe('pass');
    const detail = await h.detail(r.runId);
    expect(detail.measurements.length).toBeGreaterThan(10);
    expect(detail.measurements.every((m: MeasurementView) => m.verdict === 'pass')).toBe(true);
    // the ripple capture (2000 samples) crossed the pty in one line
    const ripple = detail.measurements.find((m: MeasurementView) => m.quantity === 'rippleMvPp');
    expect(ripple.raw.samples).toBe(2000);
  });
});
