import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { SerialPort } from 'serialport';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LineClient } from '../test-support/line-client';
import { CliUsageError, parseFixtureArgs, runFixture, type RunningFixture } from './run-fixture';

describe('parseFixtureArgs', () => {
  const files: Record<string, string> = {
    'good.json': '{"defectRates":{"weak_switch":0.1},"serials":{"K5A-2648-00001":"open_output"}}',
    'bad.json': '{"defectRates":{"melted":2}}',
    'broken.json': '{"defectRates":',
  };
  const readFile = (path: string) => {
    if (!(path in files)) throw new Error('ENOENT: no such file');
    return files[path];
  };
  const parse = (argv: string[]) => parseFixtureArgs(argv, readFile);

  it('reads the documented options with their defaults', () => {
    expect(parse(['--path', '/dev/pts/3', '--product', 'OB-BK0503'])).toMatchObject({
      path: '/dev/pts/3',
      product: 'OB-BK0503',
      timing: 'realistic',
      baudRate: 115200,
      fixtureId: 'FX-SIM',
    });
    const all = parse(['--path=/dev/x', '--product', 'OB-BK1202', '--timing', 'instant', '--baud', '57600', '--config', 'good.json', '--serial', 'KC2-2648-00009', '--lot', 'LB-1']);
    expect(all).toMatchObject({ timing: 'instant', baudRate: 57600, serial: 'KC2-2648-00009', lotCode: 'LB-1' });
    expect(all.config?.serials).toEqual({ 'K5A-2648-00001': 'open_output' });
  });

  it('says what is wrong with a bad command line', () => {
    const message = (argv: string[]) => {
      try {
        parse(argv);
        return '';
      } catch (error) {
        expect(error).toBeInstanceOf(CliUsageError);
        return (error as Error).message;
      }
    };
    expect(message(['--product', 'OB-BK0503'])).toMatch(/--path is required/);
    expect(message(['--path', '/dev/x'])).toMatch(/--product is required/);
    expect(message(['--path', '/dev/x', '--product', 'OB-XX'])).toMatch(/unknown product "OB-XX"; choose one of OB-BK0503/);
    expect(message(['--path', '/dev/x', '--product', 'OB-BK0503', '--timing', 'fast'])).toMatch(/--timing must be realistic or instant/);
    expect(message(['--path', '/dev/x', '--product', 'OB-BK0503', '--baud', '1234'])).toMatch(/--baud must be one of/);
    expect(message(['--path', '/dev/x', '--product', 'OB-BK0503', '--colour', 'red'])).toMatch(/unknown option/);
    expect(message(['--path'])).toMatch(/--path needs a value/);
    expect(message(['--path', '/dev/x', '--product', 'OB-BK0503', '--config', 'missing.json'])).toMatch(/cannot read --config missing.json/);
    expect(message(['--path', '/dev/x', '--product', 'OB-BK0503', '--config', 'broken.json'])).toMatch(/not valid JSON/);
    expect(message(['--path', '/dev/x', '--product', 'OB-BK0503', '--config', 'bad.json'])).toMatch(/defectRates.melted is not a defect/);
  });
});

const hasSocat = spawnSync('sh', ['-c', 'command -v socat']).status === 0;

/** Start a socat pseudo-terminal pair; resolves once both links exist. */
async function ptyPair(dir: string): Promise<{ a: string; b: string; socat: ChildProcess }> {
  const a = join(dir, 'a');
  const b = join(dir, 'b');
  const socat = spawn('socat', ['-d', '-d', `pty,raw,echo=0,link=${a}`, `pty,raw,echo=0,link=${b}`], { stdio: 'ignore' });
  for (let i = 0; i < 100 && !(existsSync(a) && existsSync(b)); i++) await new Promise((r) => setTimeout(r, 30));
  if (!existsSync(a) || !existsSync(b)) throw new Error('socat did not create the pty pair');
  return { a, b, socat };
}

function openPort(path: string): Promise<SerialPort> {
  return new Promise((resolveOpen, reject) => {
    const port = new SerialPort({ path, baudRate: 115200 }, (error) => (error ? reject(error) : resolveOpen(port)));
  });
}

function closePort(port: SerialPort): Promise<void> {
  return new Promise((done) => (port.isOpen ? port.close(() => done()) : done()));
}

describe.skipIf(!hasSocat)('standalone fixture over a real pseudo-terminal pair (skipped when socat is not installed: apt-get install -y socat)', () => {
  let dir: string;
  const socats: ChildProcess[] = [];

  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'railwright-pty-'));
  });

  afterAll(() => {
    for (const s of socats) if (s.pid && s.exitCode === null) s.kill('SIGTERM');
    rmSync(dir, { recursive: true, force: true });
  });

  it('serves *IDN? and readings in-process through runFixture', async () => {
    const pair = await ptyPair(mkdtempSync(join(dir, 'in-')));
    socats.push(pair.socat);
    let fixture: RunningFixture | undefined;
    let port: SerialPort | undefined;
    try {
      fixture = await runFixture({ path: pair.a, product: 'OB-BK0503', timing: 'instant', baudRate: 115200, fixtureId: 'FX-PTY', config: { defectRates: {} } });
      port = await openPort(pair.b);
      const client = new LineClient(port);
      expect(await client.query('*IDN?')).toBe('RAILWRIGHT,SIM-FIXTURE,FX-PTY,0.1.0');
      for (const line of ['SOUR:VOLT 12', 'OUTP ON']) await client.write(line);
      expect(await client.query('*OPC?')).toBe('1');
      const vout = Number(await client.query('MEAS:VOLT:OUT?'));
      expect(Math.abs(vout / 5 - 1)).toBeLessThan(0.02);
      expect(fixture.simulator.state().sourceOn).toBe(true);
      // the safe-state read-back over the pty (docs/fixture-protocol.md): the truth, both ways
      for (const line of ['LOAD:CURR 3', 'LOAD ON']) await client.write(line);
      expect([await client.query('OUTP?'), await client.query('LOAD?')]).toEqual(['1', '1']);
      for (const line of ['LOAD OFF', 'OUTP OFF']) await client.write(line);
      expect([await client.query('OUTP?'), await client.query('LOAD?')]).toEqual(['0', '0']);
    } finally {
      if (port) await closePort(port);
      if (fixture) await fixture.close();
    }
    expect(fixture.simulator.state()).toMatchObject({ sourceOn: false, loadOn: false });
  });

  describe('as a separate process (node dist/cli.js)', () => {
    const buildDir = resolve(__dirname, '../../node_modules/.cache/railwright-cli-test');

    beforeAll(() => {
      // compile the package the way `npm run build` does, into a scratch folder that still resolves
      // serialport from the workspace's node_modules; skip the compile when nothing changed since the last one
      const srcDir = resolve(__dirname, '..');
      const newestSourceMs = Math.max(
        ...readdirSync(srcDir, { recursive: true, encoding: 'utf8' })
          .filter((f) => f.endsWith('.ts'))
          .map((f) => statSync(join(srcDir, f)).mtimeMs),
      );
      const builtCli = join(buildDir, 'cli.js');
      if (existsSync(builtCli) && statSync(builtCli).mtimeMs > newestSourceMs) return;
      const tsc = spawnSync(process.execPath, [require.resolve('typescript/bin/tsc'), '-p', resolve(__dirname, '../../tsconfig.build.json'), '--outDir', buildDir], {
        encoding: 'utf8',
      });
      if (tsc.status !== 0) throw new Error(`tsc failed: ${tsc.stdout}${tsc.stderr}`);
    }, 60_000);

    it('serves the protocol on a pty and makes the fixture safe on SIGTERM', async () => {
      const pair = await ptyPair(mkdtempSync(join(dir, 'proc-')));
      socats.push(pair.socat);
      const child = spawn(process.execPath, [join(buildDir, 'cli.js'), '--path', pair.a, '--product', 'OB-BK3305', '--timing', 'instant', '--fixture-id', 'FX-CLI'], {
        stdio: ['ignore', 'ignore', 'pipe'],
      });
      let stderr = '';
      child.stderr!.on('data', (chunk) => (stderr += chunk));
      const exited = new Promise<number | null>((done) => child.on('exit', (code) => done(code)));
      try {
        for (let i = 0; i < 200 && !stderr.includes('serving'); i++) await new Promise((r) => setTimeout(r, 25));
        expect(stderr).toMatch(/fixture FX-CLI serving .* at 115200 8N1, instant timing, unit SIM-0000-00000 \(OB-BK3305/);
        const port = await openPort(pair.b);
        const client = new LineClient(port);
        expect(await client.query('*IDN?')).toBe('RAILWRIGHT,SIM-FIXTURE,FX-CLI,0.1.0');
        for (const line of ['SOUR:VOLT 24', 'OUTP ON']) await client.write(line);
        expect(await client.query('OUTP?')).toBe('1');
        expect(Number(await client.query('MEAS:VOLT:IN?'))).toBeCloseTo(24, 1);
        expect(await client.query('*OPC?')).toBe('1');
        // a reading of the modelled 3.3 V module, not just an echo of a setting
        expect(Math.abs(Number(await client.query('MEAS:VOLT:OUT?')) / 3.3 - 1)).toBeLessThan(0.02);
        await closePort(port);
      } finally {
        child.kill('SIGTERM');
      }
      expect(await exited).toBe(0);
      expect(stderr).toMatch(/SIGTERM: switching source and load off/);
    }, 20_000);

    it('exits with code 2 and the usage on a bad command line', () => {
      const run = spawnSync(process.execPath, [join(buildDir, 'cli.js'), '--path', '/dev/null', '--product', 'NOPE'], { encoding: 'utf8' });
      expect(run.status).toBe(2);
      expect(run.stderr).toMatch(/error: unknown product "NOPE"/);
      expect(run.stderr).toMatch(/usage: npm run fixture -w mock-fixture/);
    });
  });
});
