import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { yearWeekCode } from '../src/units/serial-numbers';
import { Unit, UnitState } from '../src/units/unit.entity';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * FIXTURE_SIM_CONFIG: the simulated fixtures of a running server take their defects from a file. The
 * file is read when the server starts, before the demo plant is seeded, so the serials are worked out the
 * way the seeder makes them: EOL-1's active lot of OB-BK0503 is this week's first, sequences from 00001.
 * (A bad file stopping the start is covered by src/simulation/simulator-config-file.spec.ts.)
 */
describe('simulated fixtures configured from FIXTURE_SIM_CONFIG', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-simcfg-e2e-'));
  const week = yearWeekCode(new Date());
  const goodSerial = `K5A-${week}-00001`;
  const badSerial = `K5A-${week}-00002`;
  const plainSerial = `K5A-${week}-00003`;
  /** First unit of EOL-2's lot (OB-BK3305) */
  const otherStationBad = `K3E-${week}-00001`;
  let t: TestApp;
  let h: EngineHarness;
  let stationId: number;

  beforeAll(async () => {
    const configPath = join(dir, 'sim.json');
    // no defectRates: every serial not named is good
    writeFileSync(configPath, JSON.stringify({ serials: { [goodSerial]: 'good', [badSerial]: 'wrong_feedback', [otherStationBad]: 'wrong_feedback' } }));
    t = await createTestApp({ FIXTURE_SIM_CONFIG: configPath });
    h = new EngineHarness(t, await login(t.app, 'operator'));
    stationId = (await h.station('EOL-1')).id;
    // the serials above must be the seeded ones, or this test proves nothing
    expect(await h.freshSerials('EOL-1', 3)).toEqual([goodSerial, badSerial, plainSerial]);
  });

  afterAll(async () => {
    await t?.close();
    delete process.env.FIXTURE_SIM_CONFIG;
    rmSync(dir, { recursive: true, force: true });
  });

  it('gives every simulated fixture the settings of the file (EOL-2 and its FX-102 too)', async () => {
    const eol2 = await h.station('EOL-2');
    expect((await h.freshSerials('EOL-2', 1))[0]).toBe(otherStationBad);
    const r = await h.run(eol2.id, otherStationBad);
    expect(r.verdict).toBe('fail');
    expect(r.failedStepKey).toBe('vout-no-load');
  });

  it('fails the output-voltage step of the serial the file marks wrong_feedback', async () => {
    const r = await h.run(stationId, badSerial);
    expect(r.verdict).toBe('fail');
    expect(r.failedStepKey).toBe('vout-no-load');
    const outputVoltage = r.failures.find((m) => m.stepKey === 'vout-no-load');
    expect(outputVoltage).toMatchObject({ quantity: 'voutV', unit: 'V' });
    expect(['fail', 'guard_fail']).toContain(outputVoltage!.verdict);
    // a wrong feedback divider moves the set point 6–10 % off 5.0 V (mock-fixture defects.ts)
    expect(Math.abs(outputVoltage!.value! - 5.0) / 5.0).toBeGreaterThan(0.05);
  });

  it('passes the serial the file marks good, and one it does not name (no random defects without rates)', async () => {
    expect((await h.run(stationId, goodSerial)).verdict).toBe('pass');
    expect((await h.run(stationId, plainSerial)).verdict).toBe('pass');
  });

  it('a fixture rebuilt with new port settings keeps the file settings', async () => {
    // a changed timeout rebuilds the link and its simulator, which must come back with the file's settings
    await h.setFixture('FX-101', { commandTimeoutMs: 1500 });
    // the failed unit is tested again (attempt 2 of 3): still wrong_feedback, so still a fail
    const unit = await t.orm.em.fork().findOneOrFail(Unit, { serial: badSerial });
    expect(unit.state).toBe(UnitState.Failed);
    const again = await h.run(stationId, badSerial);
    expect(again.verdict).toBe('fail');
    expect(again.failedStepKey).toBe('vout-no-load');
  });
});
