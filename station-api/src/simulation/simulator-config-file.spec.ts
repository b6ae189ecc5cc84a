import 'reflect-metadata';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { validateEnv } from '../config/env.validation';
import { readSimulatorConfigFile, SimulatorConfigFileError } from './simulator-config-file';

describe('FIXTURE_SIM_CONFIG file', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-simcfg-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  function file(name: string, text: string): string {
    const path = join(dir, name);
    writeFileSync(path, text);
    return path;
  }

  function problemOf(path: string): SimulatorConfigFileError {
    try {
      readSimulatorConfigFile(path);
    } catch (err) {
      expect(err).toBeInstanceOf(SimulatorConfigFileError);
      return err as SimulatorConfigFileError;
    }
    throw new Error(`${path} was accepted`);
  }

  it('reads rates, per-lot rates and per-serial conditions', () => {
    const path = file(
      'good.json',
      JSON.stringify({
        defectRates: { wrong_feedback: 0.01, open_output: 0.002 },
        lots: { 'LB-2648-03': { defectRates: { weak_switch: 0.2 } } },
        serials: { 'K5A-2648-00001': 'good', 'K5A-2648-00002': 'wrong_feedback' },
      }),
    );
    expect(readSimulatorConfigFile(path)).toEqual({
      defectRates: { wrong_feedback: 0.01, open_output: 0.002 },
      lots: { 'LB-2648-03': { defectRates: { weak_switch: 0.2 } } },
      serials: { 'K5A-2648-00001': 'good', 'K5A-2648-00002': 'wrong_feedback' },
    });
  });

  it('accepts an empty object (no defects anywhere)', () => {
    expect(readSimulatorConfigFile(file('empty.json', '{}'))).toEqual({});
  });

  it('names a missing file', () => {
    const path = join(dir, 'nowhere.json');
    const err = problemOf(path);
    expect(err.message).toBe(`${path}: the file does not exist`);
  });

  it('names a folder given instead of a file', () => {
    expect(problemOf(dir).message).toBe(`${dir}: this is a folder, not a file`);
  });

  it('says where JSON is broken', () => {
    const path = file('broken.json', '{"serials": {"K5A-2648-00002": "wrong_feedback",}}');
    const err = problemOf(path);
    expect(err.message.startsWith(`${path}: not valid JSON: `)).toBe(true);
  });

  it('lists every problem the simulator finds, in its own words', () => {
    const path = file(
      'bad.json',
      JSON.stringify({ defectRates: { wrong_feedback: 1.5 }, serials: { 'K5A-2648-00002': 'wrong_feedbak' }, extra: true }),
    );
    const err = problemOf(path);
    expect(err.path).toBe(path);
    expect(err.problems).toHaveLength(3);
    expect(err.message).toContain(`${path}: `);
    expect(err.message).toContain('unknown key "extra"');
    expect(err.message).toContain('defectRates.wrong_feedback must be a number from 0 to 1, got 1.5');
    expect(err.message).toContain('serials.K5A-2648-00002 must be "good" or one of');
  });

  it('refuses a JSON value that is not an object', () => {
    expect(problemOf(file('list.json', '["wrong_feedback"]')).problems).toEqual(['the configuration must be a JSON object']);
  });

  it('stops the configuration (and so the server start) with the variable, the file and the problem', () => {
    const path = join(dir, 'missing.json');
    expect(() => validateEnv({ FIXTURE_SIM_CONFIG: path })).toThrow(
      `Configuration is not valid:\n  FIXTURE_SIM_CONFIG: ${path}: the file does not exist`,
    );
    expect(validateEnv({ FIXTURE_SIM_CONFIG: file('ok.json', '{"serials": {}}') }).FIXTURE_SIM_CONFIG).toMatch(/ok\.json$/);
    expect(validateEnv({}).FIXTURE_SIM_CONFIG).toBe('');
  });
});
