import type { EntityManager } from '@mikro-orm/sqlite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import type { MeasurementView } from '../src/realtime/station-events';
import { RunRecords } from '../src/runs/run-records';
import { RunRefusal } from '../src/runs/run-refusal';
import { Station } from '../src/stations/station.entity';
import { Unit } from '../src/units/unit.entity';
import { User } from '../src/users/user.entity';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * Issue 8 run integrity: one running run per unit and per station (held by the database), runs cut off by a
 * server stop closed at start-up, the decision statement kept, the operator's name as it was, serials
 * normalised and refusals worded for a person.
 */
describe('run integrity', () => {
  let t: TestApp;
  let h: EngineHarness;
  const auth = (token = h.token) => ({ Authorization: `Bearer ${token}` });
  const sql = (q: string, params: unknown[] = []) => t.orm.em.getConnection().execute(q, params);

  beforeAll(async () => {
    t = await createTestApp();
    h = new EngineHarness(t, await login(t.app, 'operator'));
  });
  afterAll(async () => t?.close());

  it('normalises a serial typed in lower case and refuses text that is not a serial at all', async () => {
    const s = await h.station('EOL-1');
    const [serial] = await h.freshSerials('EOL-1', 1, 30);
    const ok = await h.http().post(`/api/stations/${s.id}/scan`).set(auth()).send({ serial: `  ${serial.toLowerCase()} ` }).expect(200);
    expect(ok.body.unit.serial).toBe(serial);
    const bad = await h.http().post(`/api/stations/${s.id}/scan`).set(auth()).send({ serial: 'hello world' }).expect(422);
    expect(bad.body).toMatchObject({ statusCode: 422, details: { code: 'not_a_serial' } });
    expect(bad.body.message).toBe('"HELLO WORLD" is not a serial number. Scan the label on the unit again.');
  });

  it('starts the same unit on two stations in parallel exactly once; the other gets a clear refusal', async () => {
    const em = t.orm.em.fork();
    const eol1 = await em.findOneOrFail(Station, { code: 'EOL-1' }, { populate: ['activeLot'] });
    const eol2 = await em.findOneOrFail(Station, { code: 'EOL-2' }, { populate: ['activeLot'] });
    const ownLot = eol2.activeLot;
    // station 2 pointed at station 1's lot, as on the floor (issue 8 defect 3)
    eol2.activeLot = eol1.activeLot;
    await em.flush();
    // realistic timing: the first run is still going when the second start is checked
    await h.simulate('FX-101', { defectRates: {} }, 'realistic');
    await h.simulate('FX-102', { defectRates: {} }, 'realistic');
    try {
      const [serial] = await h.freshSerials('EOL-1', 1, 40);
      const start = (stationId: number) => h.http().post(`/api/stations/${stationId}/runs`).set(auth()).send({ serial, safetyConfirmed: true });
      const answers = await Promise.all([start(eol1.id), start(eol2.id)]);
      const statuses = answers.map((a) => a.status).sort();
      expect(statuses).toEqual([201, 409]);
      const refused = answers.find((a) => a.status === 409)!;
      expect(refused.body.details.code).toBe('unit_busy');
      expect(refused.body.message).toMatch(new RegExp(`^${serial} is being tested on (station EOL-[12]|another station) right now`));
      const won = answers.find((a) => a.status === 201)!;
      const finished = await h.finished(won.body.run.id, 60_000);
      expect(finished.verdict).toBe('pass');
      const unit = await t.orm.em.fork().findOneOrFail(Unit, { serial });
      expect(unit.testCount).toBe(1);
      expect(await t.orm.em.fork().count('TestRun', { unit: unit.id })).toBe(1);
    } finally {
      const em2 = t.orm.em.fork();
      const s2 = await em2.findOneOrFail(Station, { code: 'EOL-2' });
      s2.activeLot = ownLot;
      await em2.flush();
      await h.simulate('FX-101', { defectRates: {} }, 'instant');
      await h.simulate('FX-102', { defectRates: {} }, 'instant');
    }
  });

  it('starts exactly one run when one station gets ten starts at once', async () => {
    const s = await h.station('EOL-1');
    const serials = await h.freshSerials('EOL-1', 10, 50);
    const before = (await sql('select count(*) as n from test_runs where station_id = ?', [s.id]))[0].n as number;
    const answers = await Promise.all(
      serials.map((serial) => h.http().post(`/api/stations/${s.id}/runs`).set(auth()).send({ serial, safetyConfirmed: true })),
    );
    const won = answers.filter((a) => a.status === 201);
    expect(won).toHaveLength(1);
    for (const a of answers.filter((x) => x.status !== 201)) expect(a.body).toMatchObject({ statusCode: 409, details: { code: 'station_busy' } });
    await h.finished(won[0].body.run.id);
    const after = (await sql('select count(*) as n from test_runs where station_id = ?', [s.id]))[0].n as number;
    expect(after - before).toBe(1);
    const counts = await t.orm.em.fork().find(Unit, { serial: { $in: serials } });
    expect(counts.map((u) => u.testCount).sort()).toEqual([0, 0, 0, 0, 0, 0, 0, 0, 0, 1]);
  });

  it('keeps the decision statement of every measurement and the operator name as it was at the start', async () => {
    const s = await h.station('EOL-1');
    const [serial] = await h.freshSerials('EOL-1', 1, 70);
    const r = await h.run(s.id, serial);
    expect(r.verdict).toBe('pass');
    expect(r.endReason).toBeUndefined();
    const detail = await h.detail(r.runId);
    expect(detail.endReason).toBeNull();
    expect(detail.measurements.length).toBeGreaterThan(5);
    // ILAC-G8:09/2019 §4.2.3: a passed measurement is stated pass or conditional pass, never a fail
    for (const m of detail.measurements as MeasurementView[]) expect(['pass', 'conditional_pass']).toContain(m.decision);
    const stored = await sql('select decision from measurements where run_id = ?', [r.runId]);
    expect(stored.every((row: { decision: string | null }) => row.decision !== null)).toBe(true);

    // renaming the operator changes no past run (interfaces §12)
    const em = t.orm.em.fork();
    const op = await em.findOneOrFail(User, { id: detail.operatorId });
    const nameThen = op.displayName;
    expect(detail.operatorName).toBe(nameThen);
    op.displayName = 'Renamed Later';
    await em.flush();
    try {
      expect((await h.detail(r.runId)).operatorName).toBe(nameThen);
      const list = await h.http().get(`/api/runs?serial=${serial}`).set(auth()).expect(200);
      expect(list.body.items[0].operatorName).toBe(nameThen);
    } finally {
      op.displayName = nameThen;
      await em.flush();
    }
  });

  describe('a run cut off by a server stop', () => {
    let runId: number;
    let serial: string;
    let unitId: number;
    let eol3: Station;

    beforeAll(async () => {
      eol3 = await h.station('EOL-3');
      [serial] = await h.freshSerials('EOL-3', 1, 5);
      const em = t.orm.em.fork();
      const unit = await em.findOneOrFail(Unit, { serial });
      unitId = unit.id;
      const op = await em.findOneOrFail(User, { username: 'operator' });
      const plan = (await sql(`select id from plan_versions where state = 'released' and plan_id in (select id from test_plans where product_id = ?) order by version desc`, [unit.product.id]))[0].id;
      const t0 = Date.parse('2026-12-02T10:41:50Z');
      // what a killed server leaves behind: the run row `running` and the measurements stored so far
      await sql(
        `insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, operator_name, attempt, verdict, started_at) ` +
          `values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, 'running', ?)`,
        [t0, t0, unit.id, unit.lot.id, unit.product.id, eol3.id, eol3.fixture!.id, plan, op.id, op.displayName, t0],
      );
      runId = (await sql('select id from test_runs where unit_id = ? and verdict = ?', [unit.id, 'running']))[0].id;
      const m = (i: number, key: string, name: string, at: number) =>
        sql(
          `insert into measurements (created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, uncertainty, rule, verdict, decision, raw, started_at, measured_at) ` +
            `values (?, ?, ?, ?, ?, ?, 'q', 'Q', 1.5, 'V', 0, 'simple', 'pass', 'pass', '{}', ?, ?)`,
          [at, at, runId, i, key, name, at - 100, at],
        );
      await m(0, 'vout', 'Output voltage at no load', t0 + 5000);
      await m(4, 'load-step', 'Load step', t0 + 17_000);
    });

    it('is held by the database: no second running run of the unit or the station', async () => {
      const records = new RunRecords(t.orm.em.fork() as unknown as EntityManager);
      const other = await h.station('EOL-1');
      const base = {
        serial,
        lotId: 1,
        productId: 1,
        fixtureId: other.fixture!.id,
        planVersionId: 1,
        operatorId: 1,
        operatorName: 'x',
        attempt: 1,
        startedAt: new Date(),
        fixtureIdentity: 'x',
        fixtureCalibrationDueAt: new Date(),
        fixtureContactCycles: 1,
      };
      const refusal = (p: Promise<unknown>) => p.then(() => undefined, (e: unknown) => e as RunRefusal);
      const sameUnit = await refusal(records.open({ ...base, unitId, stationId: other.id, stationCode: other.code }));
      expect(sameUnit).toBeInstanceOf(RunRefusal);
      expect(sameUnit!.code).toBe('unit_busy');
      const otherUnit = (await h.freshSerials('EOL-1', 1, 90))[0];
      const u2 = await t.orm.em.fork().findOneOrFail(Unit, { serial: otherUnit });
      const sameStation = await refusal(records.open({ ...base, unitId: u2.id, serial: otherUnit, stationId: eol3.id, stationCode: eol3.code }));
      expect(sameStation!.code).toBe('station_busy');
      // a scan says so in plain words before any start
      const scan = await h.http().post(`/api/stations/${eol3.id}/scan`).set(auth()).send({ serial }).expect(409);
      expect(scan.body.details.code).toBe('unit_busy');
    });

    it('is closed at start-up as interrupted, counted as an attempt, kept, audited and shown', async () => {
      // the hook Nest runs before the server accepts work
      await h.engine.onApplicationBootstrap();
      const detail = await h.detail(runId);
      expect(detail).toMatchObject({ verdict: 'error', endReason: 'interrupted', finishedAt: '2026-12-02T10:42:07.000Z' });
      expect(detail.errorMessage).toMatch(/^Interrupted: station server stopped at 10:42:07 UTC during step 5 \(Load step\)/);
      expect(detail.measurements.map((m: MeasurementView) => m.stepKey)).toEqual(['vout', 'load-step']);
      const unit = await t.orm.em.fork().findOneOrFail(Unit, { id: unitId });
      expect(unit).toMatchObject({ testCount: 1, state: 'untested' });
      const audit = await t.orm.em.fork().find(AuditEvent, { action: 'run.interrupted', entityId: String(runId) });
      expect(audit).toHaveLength(1);
      const listed = await h.http().get(`/api/runs?serial=${serial}`).set(auth()).expect(200);
      expect(listed.body.items[0]).toMatchObject({ id: runId, verdict: 'error', endReason: 'interrupted' });
      // nothing to abort any more, and the unit's next test is attempt 2
      const abort = await h.http().post(`/api/runs/${runId}/abort`).set(auth()).expect(409);
      expect(abort.body.details.code).toBe('run_finished');
      const scan = await h.http().post(`/api/stations/${eol3.id}/scan`).set(auth()).send({ serial }).expect(200);
      expect(scan.body.attempt).toBe(2);
    });
  });
});
