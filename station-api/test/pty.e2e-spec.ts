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

  it('identifies the fixture over the pty with the real binding', async () => {
    const s = await h.station('EOL-1');
    const link = h.links.linkFor(s.fixture!);
    expect(link.isSimulated).toBe(false);
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
