import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import { Fixture } from '../src/fixtures/fixture.entity';
import { Station } from '../src/stations/station.entity';
import { Unit, UnitState } from '../src/units/unit.entity';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/** The runs REST routes: scan refusals (every details.code), start rules, abort, lists and station status. */
describe('runs REST', () => {
  let t: TestApp;
  let h: EngineHarness;
  let engineer: string;
  let quality: string;
  let eol1: number;
  let serials: string[];
  let next = 0;
  const take = () => serials[next++];
  const auth = (token = h.token) => ({ Authorization: `Bearer ${token}` });

  beforeAll(async () => {
    t = await createTestApp();
    h = new EngineHarness(t, await login(t.app, 'operator'));
    engineer = await login(t.app, 'engineer');
    quality = await login(t.app, 'quality');
    eol1 = (await h.station('EOL-1')).id;
    serials = await h.freshSerials('EOL-1', 20);
    await h.simulate('FX-101', { defectRates: {} });
  });
  afterAll(async () => t?.close());

  const scan = (stationId: number, serial: string, token = h.token) =>
    h.http().post(`/api/stations/${stationId}/scan`).set(auth(token)).send({ serial });

  it('answers a good scan with the unit, lot, product, attempt and plan, trimming the scanned text', async () => {
    const serial = serials[0];
    const res = await scan(eol1, `  ${serial} `).expect(200);
    expect(res.body.unit).toMatchObject({ serial, state: 'untested', testCount: 0 });
    expect(res.body.product.partNumber).toBe('OB-BK0503');
    expect(res.body.attempt).toBe(1);
    expect(res.body.plan).toMatchObject({ code: 'EOL-BK0503', maxAttempts: 3 });
    expect(res.body.plan.steps.length).toBeGreaterThan(5);
  });

  it('refuses a serial of another form with pattern_mismatch', async () => {
    const res = await scan(eol1, 'K5A-26X8-0001').expect(422);
    expect(res.body).toMatchObject({ statusCode: 422, details: { code: 'pattern_mismatch' } });
    expect(res.body.message).toContain('does not match the serial form for OB-BK0503');
    // no "a OB-…" grammar slip
    expect(res.body.message).not.toMatch(/\ba OB-/);
  });

  it('refuses a well-formed serial nobody registered with unknown_serial', async () => {
    const res = await scan(eol1, 'K5A-2601-99999').expect(404);
    expect(res.body.details.code).toBe('unknown_serial');
  });

  it('refuses a unit of another lot with wrong_lot, naming both lots', async () => {
    const other = (await h.freshSerials('EOL-2', 1))[0];
    const res = await scan(eol1, other).expect(409);
    expect(res.body.details.code).toBe('wrong_lot');
    expect(res.body.message).toMatch(/belongs to lot LB-\d{4}-\d{2}, but station EOL-1 is running lot LB-\d{4}-\d{2}/);
  });

  it('refuses a passed unit with already_passed; only an engineer with a reason may retest it', async () => {
    const serial = take();
    const first = await h.run(eol1, serial);
    expect(first.verdict).toBe('pass');
    expect((await scan(eol1, serial).expect(409)).body.details.code).toBe('already_passed');
    const byOperator = await h.http().post(`/api/stations/${eol1}/runs`).set(auth()).send({ serial, safetyConfirmed: true, overrideReason: 'customer return check' });
    expect(byOperator.status).toBe(403);
    expect(byOperator.body.details.code).toBe('override_not_allowed');
    const retest = await h.run(eol1, serial, { overrideReason: 'customer return check' }, engineer);
    expect(retest.verdict).toBe('pass');
    const detail = await h.detail(retest.runId);
    expect(detail).toMatchObject({ attempt: 2, overrideReason: 'customer return check', overrideByName: 'Test engineer' });
    const em = t.orm.em.fork();
    const overrides = await em.find(AuditEvent, { action: 'run.retest_override', entityId: String(retest.runId) });
    expect(overrides).toHaveLength(1);
    expect(overrides[0].reason).toBe('customer return check');
  });

  it('refuses a unit at its attempt limit with retest_limit', async () => {
    const serial = take();
    const em = t.orm.em.fork();
    await em.nativeUpdate(Unit, { serial }, { state: UnitState.Failed, testCount: 3 });
    const res = await scan(eol1, serial).expect(409);
    expect(res.body.details).toMatchObject({ code: 'retest_limit', testCount: 3, maxAttempts: 3 });
  });

  it('refuses a unit in repair', async () => {
    const serial = take();
    await t.orm.em.fork().nativeUpdate(Unit, { serial }, { state: UnitState.InRepair });
    expect((await scan(eol1, serial).expect(409)).body.details.code).toBe('unit_not_testable');
  });

  it('refuses at a blocked station with station_blocked and the reasons in plain words', async () => {
    const s = await h.station('EOL-3');
    const em = t.orm.em.fork();
    await em.nativeUpdate(Fixture, { id: s.fixture!.id }, { calibrationDueAt: new Date('2026-11-03T12:00:00Z') });
    try {
      const serial = (await h.freshSerials('EOL-3', 1))[0];
      const res = await scan(s.id, serial).expect(409);
      expect(res.body.details.code).toBe('station_blocked');
      expect(res.body.details.reasons).toEqual(['Calibration overdue since 3 Nov 2026']);
      const status = await h.http().get(`/api/stations/${s.id}/status`).set(auth()).expect(200);
      expect(status.body).toMatchObject({ state: 'blocked', reasons: ['Calibration overdue since 3 Nov 2026'] });
      const start = await h.http().post(`/api/stations/${s.id}/runs`).set(auth()).send({ serial, safetyConfirmed: true });
      expect(start.status).toBe(409);
      expect(start.body.details.code).toBe('station_blocked');
    } finally {
      await em.nativeUpdate(Fixture, { id: s.fixture!.id }, { calibrationDueAt: s.fixture!.calibrationDueAt });
    }
  });

  it('shows a station without an active lot as idle and refuses scans there', async () => {
    const s = await h.station('EOL-3');
    const em = t.orm.em.fork();
    await em.nativeUpdate(Station, { id: s.id }, { activeLot: null });
    try {
      const status = await h.http().get(`/api/stations/${s.id}/status`).set(auth()).expect(200);
      expect(status.body).toMatchObject({ state: 'idle', reasons: ['No active lot'], activeLot: null });
      const res = await scan(s.id, 'KC2-2601-00001').expect(409);
      expect(res.body.details.code).toBe('station_blocked');
    } finally {
      await em.nativeUpdate(Station, { id: s.id }, { activeLot: s.activeLot!.id });
    }
  });

  it('refuses a second unit while one is testing with station_busy, then aborts the first', async () => {
    const serial = take();
    const sim = await h.simulate('FX-101', { defectRates: {} });
    // a fixture that stops answering keeps the run busy for seconds
    const stop = h.engine.onStepStarting((_runId, _key, stepIndex) => {
      if (stepIndex === 1) sim.mute = true;
    });
    try {
      const start = await h.http().post(`/api/stations/${eol1}/runs`).set(auth()).send({ serial, safetyConfirmed: true }).expect(201);
      const runId = start.body.run.id;
      expect(start.body.run).toMatchObject({ serial, verdict: 'running', stationCode: 'EOL-1', attempt: 1, operatorName: 'Line B operator' });
      const busy = await scan(eol1, take()).expect(409);
      expect(busy.body.details).toMatchObject({ code: 'station_busy', currentRunId: runId });
      const status = await h.http().get(`/api/stations/${eol1}/status`).set(auth()).expect(200);
      expect(status.body).toMatchObject({ state: 'testing', currentRunId: runId, currentSerial: serial });
      const abort = await h.http().post(`/api/runs/${runId}/abort`).set(auth()).expect(200);
      expect(abort.body).toMatchObject({ runId, verdict: 'aborted' });
      const again = await h.http().post(`/api/runs/${runId}/abort`).set(auth()).expect(409);
      expect(again.body.details.code).toBe('run_finished');
    } finally {
      stop();
      sim.mute = false;
    }
    // the muted fixture could not confirm it was switched off, which blocks the station until it reads back
    // off again (the link asks by itself about once a second)
    for (let i = 0; i < 50; i++) {
      const s = await h.http().get(`/api/stations/${eol1}/status`).set(auth()).expect(200);
      if (s.body.state === 'ready') break;
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
  });

  it('requires the safety confirmation, and audits it', async () => {
    const serial = take();
    const missing = await h.http().post(`/api/stations/${eol1}/runs`).set(auth()).send({ serial }).expect(400);
    expect(missing.body.details.map((d: { field: string }) => d.field)).toContain('safetyConfirmed');
    const no = await h.http().post(`/api/stations/${eol1}/runs`).set(auth()).send({ serial, safetyConfirmed: false }).expect(400);
    expect(no.body.message).toContain('safetyConfirmed must be true');
    const r = await h.run(eol1, serial);
    const events = await t.orm.em.fork().find(AuditEvent, { action: 'run.safety_confirmed', entityId: String(r.runId) }, { populate: ['actor'] });
    expect(events).toHaveLength(1);
    expect(events[0].actor?.username).toBe('operator');
  });

  it('lets only operators, engineers and admins start runs; everyone signed in reads them', async () => {
    const res = await h.http().post(`/api/stations/${eol1}/runs`).set(auth(quality)).send({ serial: take(), safetyConfirmed: true });
    expect(res.status).toBe(403);
    await h.http().get('/api/runs').set(auth(quality)).expect(200);
    await h.http().get('/api/runs').expect(401);
  });

  it('lists runs newest first with filters and paging, and 404s an unknown run', async () => {
    const all = await h.http().get(`/api/runs?stationId=${eol1}`).set(auth()).expect(200);
    expect(all.body.total).toBeGreaterThanOrEqual(4);
    const ids = all.body.items.map((r: { id: number }) => r.id);
    expect(ids).toEqual([...ids].sort((a, b) => b - a));
    const page = await h.http().get(`/api/runs?stationId=${eol1}&limit=1&offset=1`).set(auth()).expect(200);
    expect(page.body.items).toHaveLength(1);
    expect(page.body.items[0].id).toBe(ids[1]);
    const passed = await h.http().get('/api/runs?verdict=pass').set(auth()).expect(200);
    expect(passed.body.items.every((r: { verdict: string }) => r.verdict === 'pass')).toBe(true);
    // serials[0]: passed, then retested by the engineer
    const bySerial = await h.http().get(`/api/runs?serial=${serials[0]}`).set(auth()).expect(200);
    expect(bySerial.body.total).toBe(2);
    const future = await h.http().get('/api/runs?from=2999-01-01T00:00:00Z').set(auth()).expect(200);
    expect(future.body).toEqual({ items: [], total: 0 });
    const bad = await h.http().get('/api/runs?verdict=maybe&limit=0').set(auth()).expect(400);
    expect(bad.body.details.map((d: { field: string }) => d.field).sort()).toEqual(['limit', 'verdict']);
    const missing = await h.http().get('/api/runs/999999').set(auth()).expect(404);
    expect(missing.body.details.code).toBe('run_not_found');
  });

  it('finds a serial by any part of it, in lower case too (issue 12)', async () => {
    // serials[0]: passed, then retested by the engineer
    const tail = serials[0].slice(-5);
    const byPart = await h.http().get(`/api/runs?serial=${tail}`).set(auth()).expect(200);
    expect(byPart.body.items.map((r: { serial: string }) => r.serial)).toContain(serials[0]);
    const lower = await h.http().get(`/api/runs?serial=${serials[0].toLowerCase()}`).set(auth()).expect(200);
    expect(lower.body.total).toBe(2);
    expect(lower.body.items.every((r: { serial: string }) => r.serial === serials[0])).toBe(true);
    const lowerPart = await h.http().get(`/api/runs?serial=${serials[0].slice(0, 8).toLowerCase()}`).set(auth()).expect(200);
    expect(lowerPart.body.total).toBeGreaterThanOrEqual(2);
  });

  it('sorts by a whitelisted column either way and refuses any other (issue 12)', async () => {
    const list = async (q: string) => (await h.http().get(`/api/runs?${q}`).set(auth()).expect(200)).body.items as { id: number; serial: string; attempt: number; verdict: string }[];
    const bySerial = await list('sort=serial&limit=500');
    expect(bySerial.map((r) => r.serial)).toEqual([...bySerial.map((r) => r.serial)].sort());
    const bySerialDesc = await list('sort=serial&dir=desc&limit=500');
    expect(bySerialDesc.map((r) => r.serial)).toEqual([...bySerial.map((r) => r.serial)].sort().reverse());
    const byAttempt = await list('sort=attempt&dir=desc&limit=1');
    expect(byAttempt[0].attempt).toBe(Math.max(...bySerial.map((r) => r.attempt)));
    const byVerdict = await list('sort=verdict&limit=500');
    expect(byVerdict.map((r) => r.verdict)).toEqual([...byVerdict.map((r) => r.verdict)].sort());
    // default: newest first
    const dflt = await list('limit=500');
    expect(dflt.map((r) => r.id)).toEqual([...dflt.map((r) => r.id)].sort((a, b) => b - a));
    const bad = await h.http().get('/api/runs?sort=password_hash').set(auth()).expect(400);
    expect(bad.body.message).toContain('sort must be one of startedAt, serial, product, lot, station, fixture, operator, attempt, plan, verdict, failedStep, duration');
    await h.http().get('/api/runs?sort=serial&dir=sideways').set(auth()).expect(400);
  });

  it('names the failed step as the plan does, beside its key (issue 12)', async () => {
    const serial = take();
    await h.simulate('FX-101', { defectRates: {}, serials: { [serial]: 'wrong_feedback' } });
    const r = await h.run(eol1, serial);
    expect(r.verdict).toBe('fail');
    const detail = await h.detail(r.runId);
    const step = detail.steps.find((s: { key: string }) => s.key === detail.failedStepKey);
    const row = (await h.http().get(`/api/runs?serial=${serial}`).set(auth()).expect(200)).body.items[0];
    expect(row).toMatchObject({ failedStepKey: detail.failedStepKey, failedStepName: step.name });
    expect(row.failedStepName).not.toBe(row.failedStepKey);
    const passed = (await h.http().get('/api/runs?verdict=pass&limit=1').set(auth()).expect(200)).body.items[0];
    expect(passed.failedStepName).toBeNull();
    await h.simulate('FX-101', { defectRates: {} });
  });

  it('puts the live state into the station list too', async () => {
    const res = await h.http().get('/api/stations').set(auth()).expect(200);
    const eol = res.body.find((s: { code: string }) => s.code === 'EOL-1');
    expect(eol).toMatchObject({ state: 'ready', reasons: [] });
  });
});
