import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * GET /api/units/:serial/history against the real engine and simulated fixture: a unit fails, goes through
 * repair and passes; its history lists both runs newest first with measurements and traceability, and the
 * repair steps in words.
 */
describe('unit history: GET /api/units/:serial/history', () => {
  let t: TestApp;
  let h: EngineHarness;
  const tokens: Record<string, string> = {};
  let eol1: number;
  let serial: string;
  let untested: string;
  let failRunId: number;
  let passRunId: number;
  const auth = (role: string) => ({ Authorization: `Bearer ${tokens[role]}` });
  const history = (s: string, role = 'quality') => h.http().get(`/api/units/${encodeURIComponent(s)}/history`).set(auth(role));

  beforeAll(async () => {
    t = await createTestApp();
    for (const role of ['operator', 'engineer', 'quality', 'admin']) tokens[role] = await login(t.app, role);
    h = new EngineHarness(t, tokens.operator);
    eol1 = (await h.station('EOL-1')).id;
    [serial, untested] = await h.freshSerials('EOL-1', 2);
    await h.simulate('FX-101', { defectRates: {}, serials: { [serial]: 'wrong_feedback' } });
    const failed = await h.run(eol1, serial);
    expect(failed.verdict).toBe('fail');
    failRunId = failed.runId;
    const send = await h.http().post(`/api/units/${serial}/send-to-repair`).set(auth('operator')).send({ note: 'vout low' });
    expect([200, 201]).toContain(send.status);
    // returning for retest needs a repair record (symptom, cause from the engineers' list, action taken)
    const causeId = (await h.http().get('/api/repair-causes').set(auth('engineer')).expect(200)).body[0].id;
    const record = { symptom: 'output low at full load', causeId, actionTaken: 'replaced R7 feedback resistor' };
    for (const body of [{ action: 'receive', note: 'bench 2' }, { action: 'return', note: 'replaced R7 feedback resistor', ...record }]) {
      const step = await h.http().post(`/api/units/${serial}/repair`).set(auth('engineer')).send(body);
      expect(step.status, JSON.stringify(step.body)).toBe(200);
    }
    await h.simulate('FX-101', { defectRates: {}, serials: {} });
    const passed = await h.run(eol1, serial);
    expect(passed.verdict).toBe('pass');
    passRunId = passed.runId;
  });
  afterAll(async () => t?.close());

  it('lists every run newest first with its plan version, station, fixture, calibration and operator', async () => {
    const res = await history(serial).expect(200);
    const { unit, runs } = res.body;
    expect(unit).toMatchObject({ serial, state: 'passed', stateWords: 'Passed', disposition: 'Passed its final test', lot: { code: expect.any(String) }, product: { partNumber: expect.stringMatching(/^OB-BK/) } });
    expect(runs.map((r: { id: number }) => r.id)).toEqual([passRunId, failRunId]);
    const [pass, fail] = runs;
    expect(pass).toMatchObject({ verdict: 'pass', attempt: 2, station: { id: eol1, code: 'EOL-1' }, fixture: { code: 'FX-101' }, operator: { username: 'operator' } });
    expect(pass.plan).toMatchObject({ code: expect.any(String), version: expect.any(Number), checksum: expect.stringMatching(/^[0-9a-f]{16,}$/) });
    expect(pass.fixture.calibrationDueAt).toMatch(/^\d{4}-\d{2}-\d{2}T/);
    expect(pass.fixture.calibrationDueAtRun).toMatch(/^\d{4}-\d{2}-\d{2}T/);
    expect(fail.verdict).toBe('fail');
    // every measurement with limits and decision, matching the run detail the engine stored
    const detail = await h.detail(failRunId);
    expect(fail.measurements).toHaveLength(detail.measurements.length);
    const m = fail.measurements.find((x: { verdict: string }) => x.verdict === 'fail');
    expect(m).toMatchObject({ name: expect.any(String), unit: expect.any(String), value: expect.any(Number), rule: expect.any(String) });
    expect(m.lowLimit ?? m.highLimit).not.toBeNull();
    expect(JSON.stringify(res.body)).not.toMatch(/password|hash/i);
  });

  it('lists the repair steps and the send-to-repair in words, newest first, with the technician\'s note', async () => {
    const { events, repairRecords } = (await history(serial).expect(200)).body;
    const unitEvents = events.filter((e: { entityType: string }) => e.entityType === 'unit');
    expect(unitEvents.map((e: { what: string }) => e.what)).toEqual([
      `Returned unit ${serial} from repair for retest`,
      `Received unit ${serial} in repair`,
      `Sent unit ${serial} to repair`,
    ]);
    expect(unitEvents[0]).toMatchObject({ reason: 'replaced R7 feedback resistor', actorName: 'engineer' });
    // the repair record (symptom, cause, action taken) is shown with the return
    const record = repairRecords[String(unitEvents[0].id)] as { field: string; value: string }[];
    expect(record.map((r) => r.value)).toEqual(expect.arrayContaining(['output low at full load', 'replaced R7 feedback resistor']));
    expect(unitEvents[0].changes).toEqual(expect.arrayContaining([{ field: 'State', before: 'in repair', after: 'untested' }]));
  });

  it('accepts the serial in lower case with spaces around it (as typed or scanned)', async () => {
    const res = await history(`  ${serial.toLowerCase()} `).expect(200);
    expect(res.body.unit.serial).toBe(serial);
  });

  it('shows a registered unit that was never tested, with no runs', async () => {
    const res = await history(untested, 'operator').expect(200);
    expect(res.body).toMatchObject({ unit: { serial: untested, state: 'untested', stateWords: 'Untested' }, runs: [], events: [] });
  });

  it('answers 404 in plain words for an unknown serial, 400 for an over-long one, 401 without sign-in', async () => {
    const res = await history('K5A-0000-99999').expect(404);
    expect(res.body.message).toBe('No unit with serial "K5A-0000-99999" is registered. Check the label and try again.');
    expect(res.body.details).toMatchObject({ code: 'unknown_serial' });
    await history('X'.repeat(65)).expect(400);
    await h.http().get(`/api/units/${serial}/history`).expect(401);
  });
});
