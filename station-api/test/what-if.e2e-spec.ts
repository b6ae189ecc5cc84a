import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EntityManager } from '@mikro-orm/sqlite';
import { demoHistoryContext, insertHistory, type HistoryRun } from '../src/what-if/stored-history';
import { createTestApp, login, TestApp } from './create-test-app';

/**
 * What-if before release, on a small stored history whose outcome was worked out by hand (self-constructed
 * example). Draft of EOL-BK0503: voutV@1.5 from 4.9 … 5.1 V to 4.8 … 5.05 V (guarded, U = 0.01 V, so accepted
 * 4.81 … 5.04 V), rippleMvPp high from 30 to 25 mV (simple).
 *
 * unit  first run  voutV@1.5  ripple  stored verdicts     draft verdicts             unit
 * A     pass       5.000      20      pass pass           pass pass                  pass → pass
 * B     pass       5.060      20      pass pass           FAIL pass                  pass → fail
 * C     pass       5.045      22      pass pass           guard fail pass            pass → fail
 * D     pass       5.000      27      pass pass           pass FAIL                  pass → fail
 * E     fail       5.000      32      pass fail           pass fail                  fail → fail
 * F     fail       4.850      20      fail pass           PASS pass                  fail → pass
 * G     fail       4.950      31      pass fail           pass fail                  fail (its passing retest is not a first run)
 * H     error      —          —                                                      not judged, out of scope
 * I     fail       4.700      —       fail (stopped)      fail                       fail → fail
 * J     fail       4.850      —       fail (stopped)      pass, ripple unknown       unknown
 * Units in scope 9; stored FPY 4/9; predicted 2 pass (A, F) of 8 with a prediction; pass→fail 3, fail→pass 1.
 * voutV@1.5 changes: pass→fail B, C; fail→pass F, J. rippleMvPp: pass→fail D.
 */
describe('what-if before release', () => {
  let t: TestApp;
  let engineer: string;
  let operator: string;
  const http = () => request(t.app.getHttpServer());
  const as = (token: string) => ({ Authorization: `Bearer ${token}` });
  let draftId: number;
  let runIds: number[];
  let lotId: number;

  const vout = (value: number | null, verdict: 'pass' | 'fail' | 'guard_fail') => ({ stepIndex: 2, stepKey: 'vout-load', quantity: 'voutV@1.5', unit: 'V', value, low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded', verdict });
  const ripple = (value: number, verdict: 'pass' | 'fail') => ({ stepIndex: 6, stepKey: 'ripple', quantity: 'rippleMvPp', unit: 'mV', value, high: 30, uncertainty: 1, rule: 'simple', verdict });
  const day = (d: number, h = 8) => new Date(Date.UTC(2026, 10, d, h));

  beforeAll(async () => {
    t = await createTestApp();
    engineer = await login(t.app, 'engineer');
    operator = await login(t.app, 'operator');
    const em = t.orm.em.fork() as EntityManager;
    const ctx = await demoHistoryContext(em, 'OB-BK0503');
    lotId = ctx.lotId;
    const s = (x: string) => `K5A-2647-0000${x}`;
    const history: HistoryRun[] = [
      { serial: s('1'), verdict: 'pass', startedAt: day(2), measurements: [vout(5.0, 'pass'), ripple(20, 'pass')] },
      { serial: s('2'), verdict: 'pass', startedAt: day(2, 9), measurements: [vout(5.06, 'pass'), ripple(20, 'pass')] },
      { serial: s('3'), verdict: 'pass', startedAt: day(3), measurements: [vout(5.045, 'pass'), ripple(22, 'pass')] },
      { serial: s('4'), verdict: 'pass', startedAt: day(3, 9), measurements: [vout(5.0, 'pass'), ripple(27, 'pass')] },
      { serial: s('5'), verdict: 'fail', startedAt: day(4), measurements: [vout(5.0, 'pass'), ripple(32, 'fail')] },
      { serial: s('6'), verdict: 'fail', startedAt: day(4, 9), measurements: [vout(4.85, 'fail'), ripple(20, 'pass')] },
      { serial: s('7'), verdict: 'fail', startedAt: day(5), measurements: [vout(4.95, 'pass'), ripple(31, 'fail')] },
      { serial: s('7'), verdict: 'pass', startedAt: day(5, 12), measurements: [vout(4.95, 'pass'), ripple(24, 'pass')] },
      { serial: s('8'), verdict: 'error', startedAt: day(6), measurements: [vout(5.0, 'pass')] },
      { serial: s('9'), verdict: 'fail', startedAt: day(6, 9), measurements: [vout(4.7, 'fail')] },
      { serial: 'K5A-2647-00010', verdict: 'fail', startedAt: day(7), measurements: [vout(4.85, 'fail')] },
    ];
    runIds = await insertHistory(em, ctx, history);

    const plan = (await http().get('/api/plans').set(as(operator)).expect(200)).body.find((p: { code: string }) => p.code === 'EOL-BK0503');
    const draft = await http().post(`/api/plan-versions/${plan.releasedVersion.id}/drafts`).set(as(engineer)).send({ reason: 'Tighter output, lower ripple' }).expect(201);
    const steps = structuredClone(draft.body.steps);
    Object.assign(steps[2].limits[0], { low: 4.8, high: 5.05 });
    steps[6].limits[0].high = 25;
    await http().patch(`/api/plan-versions/${draft.body.id}`).set(as(engineer)).send({ steps }).expect(200);
    draftId = draft.body.id;
  });
  afterAll(async () => t?.close());

  it('counts the verdict changes of the hand-computed case', async () => {
    const res = await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(engineer)).send({ scope: 'lot', lotId }).expect(200);
    const r = res.body;
    expect(r).toMatchObject({ unitsInScope: 9, passToFail: 3, failToPass: 1, unknown: 1, measurementsJudged: 16 });
    expect(r.currentFpy).toMatchObject({ x: 4, n: 9 });
    expect(r.predictedFpy).toMatchObject({ x: 2, n: 8, estimate: 0.25, confidence: 0.95, method: 'Wilson score' });
    // Wilson score interval (E. B. Wilson, JASA 22:209–212, 1927) for 2/8, z = 1.959964, evaluated by hand:
    // centre (0.25 + z²/16) / (1 + z²/8) = 0.331102, half-width z·√(0.25·0.75/8 + z²/256) / (1 + z²/8) = 0.259622
    expect(r.predictedFpy.lower).toBeCloseTo(0.07148, 4);
    expect(r.predictedFpy.upper).toBeCloseTo(0.59072, 4);

    const limit = (k: string) => r.perLimit.find((l: { limitKey: string }) => l.limitKey === k);
    expect(limit('voutV@1.5')).toMatchObject({ stepKey: 'vout-load', passToFail: 2, failToPass: 2, measured: 9 });
    expect(limit('rippleMvPp')).toMatchObject({ stepKey: 'ripple', passToFail: 1, failToPass: 0, measured: 7 });
    expect(limit('voutV@3')).toMatchObject({ passToFail: 0, failToPass: 0, measured: 0 });
    expect(r.perStep.find((s: { stepKey: string }) => s.stepKey === 'vout-load')).toMatchObject({ passToFail: 2, failToPass: 2 });
    expect(r.perStep.find((s: { stepKey: string }) => s.stepKey === 'ripple')).toMatchObject({ passToFail: 1, failToPass: 0 });
    expect(r.unmeasuredLimits).toContainEqual({ stepKey: 'vout-load', limitKey: 'voutV@3' });

    const affected = Object.fromEntries(r.affected.map((a: { serial: string; before: string; after: string; runId: number }) => [a.serial, [a.before, a.after, a.runId]]));
    expect(affected).toEqual({
      'K5A-2647-00002': ['pass', 'fail', runIds[1]],
      'K5A-2647-00003': ['pass', 'fail', runIds[2]],
      'K5A-2647-00004': ['pass', 'fail', runIds[3]],
      'K5A-2647-00006': ['fail', 'pass', runIds[5]],
    });
    const c = r.affected.find((a: { serial: string }) => a.serial === 'K5A-2647-00003');
    expect(c.limits).toEqual([{ stepKey: 'vout-load', limitKey: 'voutV@1.5', value: 5.045, before: 'pass', after: 'fail' }]);
  });

  it('scopes by last N units and by date range', async () => {
    // the three most recently first-tested units: J (7 Nov), I (6 Nov 09:00), G (5 Nov)
    const last = await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(engineer)).send({ scope: 'last_units', units: 3 }).expect(200);
    expect(last.body).toMatchObject({ unitsInScope: 3, passToFail: 0, failToPass: 0, unknown: 1, scopeText: 'last 3 units tested' });
    const dates = await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(engineer)).send({ scope: 'dates', from: '2026-11-02', to: '2026-11-03' }).expect(200);
    expect(dates.body).toMatchObject({ unitsInScope: 4, passToFail: 3, failToPass: 0 });
    const bad = await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(engineer)).send({ scope: 'dates', from: '2026-11-05' }).expect(400);
    expect(bad.body.details[0].field).toBe('to');
    await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(engineer)).send({ scope: 'everything' }).expect(400);
    await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(operator)).send({ scope: 'last_units', units: 3 }).expect(403);
  });

  it('writes nothing: every table has the same rows and content before and after', async () => {
    const snapshot = async () => {
      const conn = t.orm.em.fork().getConnection();
      // tables and views: `measurements` is a view over the compact tables (Migration20261203010000)
      const tables = await conn.execute<{ name: string; type: string }[]>("select name, type from sqlite_master where type in ('table', 'view') order by name");
      const out: Record<string, { rows: number; sha256: string }> = {};
      for (const { name, type } of tables) {
        // a view has no rowid; neither has a WITHOUT ROWID table (run_steps), whose plain scan comes in primary-key order
        const rows = await (type === 'view'
          ? conn.execute(`select * from \`${name}\` order by 1`)
          : conn.execute(`select * from \`${name}\` order by rowid`).catch(() => conn.execute(`select * from \`${name}\``)));
        out[name] = { rows: rows.length, sha256: createHash('sha256').update(JSON.stringify(rows)).digest('hex') };
      }
      return out;
    };
    const before = await snapshot();
    expect(before.measurements.rows).toBe(19);
    for (const scope of [{ scope: 'lot', lotId }, { scope: 'last_units', units: 5 }, { scope: 'dates', from: '2026-11-01', to: '2026-11-30' }]) {
      await http().post(`/api/plan-versions/${draftId}/what-if`).set(as(engineer)).send(scope).expect(200);
    }
    expect(await snapshot()).toEqual(before);
  });

  it('a run view names the plan version and checksum it used', async () => {
    const plan = (await http().get('/api/plans').set(as(operator)).expect(200)).body.find((p: { code: string }) => p.code === 'EOL-BK0503');
    const run = await http().get(`/api/runs/${runIds[0]}`).set(as(engineer)).expect(200);
    expect(run.body).toMatchObject({ planVersionId: plan.releasedVersion.id, planChecksum: plan.releasedVersion.checksum });
  });

  it('is for drafts only', async () => {
    const plan = (await http().get('/api/plans').set(as(operator)).expect(200)).body.find((p: { code: string }) => p.code === 'EOL-BK0503');
    const res = await http().post(`/api/plan-versions/${plan.releasedVersion.id}/what-if`).set(as(engineer)).send({ scope: 'lot', lotId }).expect(400);
    expect(res.body.details.code).toBe('not_draft');
  });
});
