import { jStat } from 'jstat';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import { CharacterizationDataSet } from '../src/characterization/characterization-data-set.entity';
import { REPO_ROOT } from '../src/plans/plan-artifacts';
import { createTestApp, login, TestApp } from './create-test-app';

const DEMO_CSV = join(REPO_ROOT, 'test-plans', 'characterization', 'OB-BK0503-pilot-P2.csv');
const ROUTE = '/api/characterization/data-sets';

// Shapiro & Wilk, Biometrika 52 (1965), worked example: weights (lb) of 11 men, as printed there
const WEIGHTS_LB = [148, 154, 158, 160, 161, 162, 166, 170, 182, 195, 236];

describe('characterization data: upload, figures, limits into a draft', () => {
  let t: TestApp;
  let engineer: string;
  let quality: string;
  let operator: string;
  const http = () => request(t.app.getHttpServer());
  const as = (token: string) => ({ Authorization: `Bearer ${token}` });
  const stored = () => t.orm.em.fork().count(CharacterizationDataSet, {});
  const upload = (token: string, body: Buffer | string, fileName: string, name: string, product?: string) => {
    const r = http().post(ROUTE).set(as(token)).field('name', name);
    if (product) r.field('product', product);
    return r.attach('file', typeof body === 'string' ? Buffer.from(body, 'utf8') : body, fileName);
  };

  beforeAll(async () => {
    t = await createTestApp();
    [engineer, quality, operator] = await Promise.all(['engineer', 'quality', 'operator'].map((u) => login(t.app, u)));
  });
  afterAll(async () => t?.close());

  let demoId: number;

  it('stores a good file with its columns, units and counts; lists and returns it', async () => {
    const res = await upload(engineer, readFileSync(DEMO_CSV), 'OB-BK0503-pilot-P2.csv', 'OB-BK0503 pilot build P2', 'OB-BK0503').expect(201);
    demoId = res.body.id;
    expect(res.body).toMatchObject({ name: 'OB-BK0503 pilot build P2', fileName: 'OB-BK0503-pilot-P2.csv', rowCount: 60, product: { partNumber: 'OB-BK0503' }, uploadedBy: { username: 'engineer' } });
    expect(res.body.columns.find((c: { key: string }) => c.key === 'vout_1.5A_V')).toEqual({ key: 'vout_1.5A_V', name: 'vout_1.5A', unit: 'V', count: 60 });
    expect(res.body.columns.find((c: { key: string }) => c.key === 'ripple_mV').count).toBe(59);
    const list = await http().get(ROUTE).set(as(quality)).expect(200);
    expect(list.body.map((d: { id: number }) => d.id)).toContain(demoId);
    expect(list.body[0].values).toBeUndefined();
    const one = await http().get(`${ROUTE}/${demoId}`).set(as(engineer)).expect(200);
    expect(one.body.serials[0]).toBe('K5A-2648-00001');
    expect(one.body.values['vout_1.5A_V']).toHaveLength(60);
    const audit = await t.orm.em.fork().findOneOrFail(AuditEvent, { action: 'characterization.uploaded', entityId: String(demoId) });
    expect(audit.after).toMatchObject({ name: 'OB-BK0503 pilot build P2', units: 60 });
  });

  it('refuses each bad file with its own message and stores nothing', async () => {
    const before = await stored();
    const cases: Array<[string | Buffer, RegExp, number?]> = [
      ['', /the file is empty/],
      ['serial,vout_V\n', /header but no units/],
      ['unit,vout_V\nA1,5\n', /line 1, column unit: the first column must be "serial"/],
      ['serial,vout\nA1,5\n', /column vout: "vout" does not end in its unit/],
      ['serial,vout_V,vout_V\nA1,5,5\n', /column "vout_V" appears twice/],
      ['serial,vout_V\nA1,5.01\nA2,5.0x\n', /line 3, column vout_V: "5.0x" is not a number/],
      ['serial;vout_V\nA1;5,012\n', /use a point as the decimal separator/],
      // "µ" written in Windows-1252 is the single byte 0xB5 (Windows-1252 code page table), not UTF-8
      [Buffer.concat([Buffer.from('serial,recovery_us\nA1,4'), Buffer.from([0xb5]), Buffer.from('\n')]), /not UTF-8 text \(byte 0xB5 at line 2/],
      [Buffer.alloc(1024 * 1024 + 10, 0x20), /larger than the 1048576 bytes \(1 MiB\) accepted/, 413],
    ];
    for (const [body, message, status] of cases) {
      const res = await upload(engineer, body, 'bad.csv', 'A refused file').expect(status ?? 400);
      expect(res.body.message).toMatch(message);
      expect(res.body.details.problems.length).toBeGreaterThan(0);
    }
    const noFile = await http().post(ROUTE).set(as(engineer)).field('name', 'No file at all').expect(400);
    expect(noFile.body.message).toMatch(/send the CSV as multipart form field "file"/);
    const noName = await http().post(ROUTE).set(as(engineer)).attach('file', Buffer.from('serial,vout_V\nA1,5\n'), 'a.csv').expect(400);
    expect(noName.body.message).toMatch(/name must/);
    const badProduct = await upload(engineer, 'serial,vout_V\nA1,5\n', 'a.csv', 'Unknown product', 'OB-XX9999').expect(400);
    expect(badProduct.body.message).toMatch(/There is no product OB-XX9999/);
    const twice = await upload(engineer, 'serial,vout_V\nA1,5\n', 'a.csv', 'OB-BK0503 pilot build P2').expect(409);
    expect(twice.body.message).toMatch(/already exists/);
    expect(await stored()).toBe(before);
  });

  it('lets quality read but not upload, and keeps operators out', async () => {
    await upload(quality, 'serial,vout_V\nA1,5\n', 'a.csv', 'Quality try').expect(403);
    await upload(operator, 'serial,vout_V\nA1,5\n', 'a.csv', 'Operator try').expect(403);
    await http().get(ROUTE).set(as(operator)).expect(403);
    await http().get(`${ROUTE}/${demoId}/analysis`).query({ column: 'vout_1.5A_V' }).set(as(operator)).expect(403);
    await http().get(`${ROUTE}/${demoId}/analysis`).query({ column: 'vout_1.5A_V' }).set(as(quality)).expect(200);
  });

  it('computes the figures of a published data set as the outside references do', async () => {
    const csv = 'serial,weight_lb\n' + WEIGHTS_LB.map((w, i) => `M${i + 1},${w}`).join('\n') + '\n';
    const res = await upload(engineer, csv, 'weights.csv', 'Shapiro-Wilk 1965 weights').expect(201);
    const a = await http().get(`${ROUTE}/${res.body.id}/analysis`).query({ column: 'weight_lb', low: 120, high: 240 }).set(as(quality)).expect(200);
    expect(a.body.n).toBe(11);
    expect(a.body.mean).toBeCloseTo(mean(WEIGHTS_LB), 10); // simple-statistics mean as reference
    expect(a.body.sd).toBeCloseTo(sampleStandardDeviation(WEIGHTS_LB), 10); // simple-statistics sampleStandardDeviation as reference
    // Shapiro & Wilk (1965) worked example W = 0.79 (from memory, unverified); SciPy 1.17.1 scipy.stats.shapiro gives
    // W = 0.7888146948631716, p = 0.006703814061898823
    expect(a.body.normality.shapiroWilk.statistic).toBeCloseTo(0.7888147, 5);
    expect(a.body.normality.shapiroWilk.pValue).toBeCloseTo(0.0067038, 4);
    expect(a.body.normality.reading).toMatch(/do not look normal/);
    // Cpk = min(USL − x̄, x̄ − LSL)/(3σ) (NIST/SEMATECH e-Handbook §6.1.6), σ within = MR̄/d2 with d2 = 1.128
    // (Montgomery, Introduction to SQC, Appendix VI), Ppk with the sample standard deviation
    let mr = 0;
    for (let i = 1; i < WEIGHTS_LB.length; i++) mr += Math.abs(WEIGHTS_LB[i] - WEIGHTS_LB[i - 1]);
    const sigmaWithin = mr / (WEIGHTS_LB.length - 1) / 1.128;
    const m = mean(WEIGHTS_LB);
    const s = sampleStandardDeviation(WEIGHTS_LB);
    expect(a.body.capability.cpk.value).toBeCloseTo(Math.min(240 - m, m - 120) / (3 * sigmaWithin), 10);
    expect(a.body.capability.ppk.value).toBeCloseTo(Math.min(240 - m, m - 120) / (3 * s), 10);
    // Bissell (1990) interval: Ĉ ± 1.959964·√(1/(9n) + Ĉ²/(2(n − 1))); z from jStat.normal.inv as reference
    const ppk = a.body.capability.ppk.value;
    const half = jStat.normal.inv(0.975, 0, 1) * Math.sqrt(1 / (9 * 11) + (ppk * ppk) / (2 * 10));
    expect(a.body.capability.ppk.lower).toBeCloseTo(ppk - half, 8);
    // expected ppm outside, normal model N(x̄, s): jStat.normal.cdf as reference
    const ppm = 1e6 * (jStat.normal.cdf(120, m, s) + 1 - jStat.normal.cdf(240, m, s));
    expect(Math.abs(a.body.ppmOutside.total - ppm) / ppm).toBeLessThan(1e-6);
    expect(a.body.histogram.counts.reduce((x: number, y: number) => x + y, 0)).toBe(11);
    expect(a.body.histogram.edges[0]).toBeLessThanOrEqual(120);
  });

  it('answers bad analysis requests with 400, never 500', async () => {
    const unknown = await http().get(`${ROUTE}/${demoId}/analysis`).query({ column: 'nope_V' }).set(as(engineer)).expect(400);
    expect(unknown.body.message).toMatch(/has no column "nope_V"; its columns are serial|its columns are iin_no_load_mA/);
    const crossed = await http().get(`${ROUTE}/${demoId}/analysis`).query({ column: 'vout_1.5A_V', low: 5.1, high: 5.0 }).set(as(engineer)).expect(400);
    expect(crossed.body.message).toMatch(/must be below/);
    await http().get(`${ROUTE}/${demoId}/analysis`).query({ column: 'vout_1.5A_V', low: 'abc' }).set(as(engineer)).expect(400);
    await http().get(`${ROUTE}/999999/analysis`).query({ column: 'vout_1.5A_V' }).set(as(engineer)).expect(404);
  });

  async function demoPlan() {
    const plans = await http().get('/api/plans').set(as(engineer)).expect(200);
    return plans.body.find((p: { product: { partNumber: string } }) => p.product.partNumber === 'OB-BK0503');
  }

  it('puts accepted limits into a draft and records the data set and its statistics in the audit trail', async () => {
    const plan = await demoPlan();
    const draft = (await http().post(`/api/plan-versions/${plan.releasedVersion.id}/drafts`).set(as(engineer)).send({ reason: 'Limits from pilot build P2' }).expect(201)).body;
    const figures = (await http().get(`${ROUTE}/${demoId}/analysis`).query({ column: 'vout_1.5A_V', low: 4.96, high: 5.045 }).set(as(engineer)).expect(200)).body;
    const res = await http()
      .post(`${ROUTE}/${demoId}/accept`)
      .set(as(engineer))
      .send({ column: 'vout_1.5A_V', planVersionId: draft.id, stepKey: 'vout-load', limitKey: 'voutV@1.5', low: 4.96, high: 5.045, reason: 'Pilot build P2: 60 units, Ppk above 1.33' })
      .expect(200);
    expect(res.body.limitAfter).toMatchObject({ key: 'voutV@1.5', low: 4.96, high: 5.045, uncertainty: 0.01, rule: 'guarded' });
    expect(res.body.limitBefore).toMatchObject({ low: 4.9, high: 5.1 });
    const version = (await http().get(`/api/plan-versions/${draft.id}`).set(as(engineer)).expect(200)).body;
    const limit = version.steps.find((s: { key: string }) => s.key === 'vout-load').limits.find((l: { key: string }) => l.key === 'voutV@1.5');
    expect(limit).toMatchObject({ low: 4.96, high: 5.045 });
    expect(version.checksum).not.toBe(draft.checksum);

    const em = t.orm.em.fork();
    const event = await em.findOneOrFail(AuditEvent, { action: 'characterization.limits_accepted', entityType: 'characterization', entityId: String(demoId) });
    expect(event.reason).toBe('Pilot build P2: 60 units, Ppk above 1.33');
    const after = event.after as {
      dataSet: Record<string, unknown>;
      n: number;
      statistics: { mean: number; sd: number; cpk: { value: number }; ppk: { value: number }; normality: { pValue: number }; ppmOutside: { total: number } };
    };
    expect(after.dataSet).toMatchObject({ name: 'OB-BK0503 pilot build P2', units: 60 });
    expect(after.n).toBe(60);
    expect(after.statistics.mean).toBeCloseTo(figures.mean, 12);
    expect(after.statistics.sd).toBeCloseTo(figures.sd, 12);
    expect(after.statistics.cpk.value).toBeCloseTo(figures.capability.cpk.value, 12);
    expect(after.statistics.ppk.value).toBeCloseTo(figures.capability.ppk.value, 12);
    expect(after.statistics.normality.pValue).toBeCloseTo(figures.normality.primary.pValue, 12);
    expect(after.statistics.ppmOutside.total).toBeCloseTo(figures.ppmOutside.total, 9);
    expect(after).toMatchObject({ plan: 'EOL-BK0503', planVersionId: draft.id, step: 'vout-load', limit: { low: 4.96, high: 5.045 } });
    const edited = await em.find(AuditEvent, { action: 'plan_version.edited', entityId: String(draft.id) });
    expect(edited.map((e) => e.reason)).toContain('Pilot build P2: 60 units, Ppk above 1.33');

    // one-sided: only a high limit, its low removed
    const oneSided = await http()
      .post(`${ROUTE}/${demoId}/accept`)
      .set(as(engineer))
      .send({ column: 'ripple_mV', planVersionId: draft.id, stepKey: 'ripple', limitKey: 'rippleMvPp', high: 28, reason: 'ripple from pilot build' })
      .expect(200);
    expect(oneSided.body.limitAfter.high).toBe(28);
    expect(oneSided.body.limitAfter.low).toBeUndefined();
  });

  it('takes the suggestion\'s k and U the engineer chose: the analysis follows them, the limit gets that U, the audit trail records both', async () => {
    const column = 'vout_1.5A_V';
    const values = ((await http().get(`${ROUTE}/${demoId}`).set(as(engineer)).expect(200)).body.values[column] as (number | null)[]).filter((v): v is number => v !== null);
    const m = mean(values); // simple-statistics mean as reference
    const s = sampleStandardDeviation(values); // simple-statistics sampleStandardDeviation as reference
    const a = (await http().get(`${ROUTE}/${demoId}/analysis`).query({ column, k: 3, uncertainty: 0.02 }).set(as(engineer)).expect(200)).body;
    expect(a.suggestion).toMatchObject({ k: 3, uncertainty: 0.02 });
    // tolerance x̄ ± k·s; ILAC-G8:09/2019 §4.2.2 guarded acceptance (w = U): lower AL = TL + U, upper AL = TL − U
    expect(a.suggestion.tolerance.low).toBeCloseTo(m - 3 * s, 10);
    expect(a.suggestion.tolerance.high).toBeCloseTo(m + 3 * s, 10);
    expect(a.suggestion.acceptance.low).toBeCloseTo(m - 3 * s + 0.02, 10);
    expect(a.suggestion.acceptance.high).toBeCloseTo(m + 3 * s - 0.02, 10);
    // the API's bounds, as the screen repeats them on its fields
    expect((await http().get(`${ROUTE}/${demoId}/analysis`).query({ column, k: 0.2 }).set(as(engineer)).expect(400)).body.message).toMatch(/k must be at least 0.5/);
    expect((await http().get(`${ROUTE}/${demoId}/analysis`).query({ column, k: 12 }).set(as(engineer)).expect(400)).body.message).toMatch(/k must be at most 10/);
    expect((await http().get(`${ROUTE}/${demoId}/analysis`).query({ column, uncertainty: -1 }).set(as(engineer)).expect(400)).body.message).toMatch(/uncertainty must be 0 or more/);

    const plan = await demoPlan();
    const draft = (await http().post(`/api/plan-versions/${plan.releasedVersion.id}/drafts`).set(as(engineer)).send({ reason: 'Limits at 3 s from pilot build P2' }).expect(201)).body;
    const low = Number(a.suggestion.tolerance.low.toFixed(4));
    const high = Number(a.suggestion.tolerance.high.toFixed(4));
    const body = { column, planVersionId: draft.id, stepKey: 'vout-load', limitKey: 'voutV@1.5', low, high, k: 3, uncertainty: 0.02, rule: 'guarded', reason: 'Pilot build P2 at 3 s, guarded by U of FX-101' };
    expect((await http().post(`${ROUTE}/${demoId}/accept`).set(as(engineer)).send({ ...body, k: 0.1 }).expect(400)).body.message).toMatch(/k must be at least 0.5/);
    const res = await http().post(`${ROUTE}/${demoId}/accept`).set(as(engineer)).send(body).expect(200);
    expect(res.body.limitAfter).toMatchObject({ key: 'voutV@1.5', low, high, uncertainty: 0.02, rule: 'guarded' });
    expect(res.body.statistics.suggestion).toMatchObject({ k: 3, uncertainty: 0.02 });

    const event = await t.orm.em.fork().findOneOrFail(AuditEvent, { id: res.body.auditEventId });
    const after = event.after as { statistics: { suggestion: { k: number; uncertainty: number; tolerance: { low: number; high: number }; acceptance: { low: number; high: number } } }; limit: Record<string, unknown> };
    expect(after.statistics.suggestion.k).toBe(3);
    expect(after.statistics.suggestion.uncertainty).toBe(0.02);
    expect(after.statistics.suggestion.tolerance.low).toBeCloseTo(m - 3 * s, 10);
    expect(after.statistics.suggestion.acceptance.high).toBeCloseTo(m + 3 * s - 0.02, 10);
    expect(after.limit).toMatchObject({ low, high, uncertainty: 0.02, rule: 'guarded' });
  });

  it('refuses a released version with 409, a wrong step, unit or physical range with 400, and changes nothing', async () => {
    const plan = await demoPlan();
    const released = plan.releasedVersion.id;
    const before = (await http().get(`/api/plan-versions/${released}`).set(as(engineer)).expect(200)).body;
    const eventsBefore = await t.orm.em.fork().count(AuditEvent, { action: 'characterization.limits_accepted' });
    const body = { column: 'vout_1.5A_V', planVersionId: released, stepKey: 'vout-load', limitKey: 'voutV@1.5', low: 4.96, high: 5.045, reason: 'try the released one' };
    const refused = await http().post(`${ROUTE}/${demoId}/accept`).set(as(engineer)).send(body).expect(409);
    expect(refused.body.message).toMatch(/only a draft can be edited/);
    const after = (await http().get(`/api/plan-versions/${released}`).set(as(engineer)).expect(200)).body;
    expect(after.checksum).toBe(before.checksum);

    const draft = (await http().post(`/api/plan-versions/${released}/drafts`).set(as(engineer)).send({ reason: 'second try' }).expect(201)).body;
    const send = (over: Record<string, unknown>) => http().post(`${ROUTE}/${demoId}/accept`).set(as(engineer)).send({ ...body, planVersionId: draft.id, ...over });
    expect((await send({ stepKey: 'nope' }).expect(400)).body.message).toMatch(/has no step "nope"/);
    expect((await send({ limitKey: 'voutV@9' }).expect(400)).body.message).toMatch(/has no limit "voutV@9"/);
    expect((await send({ column: 'ripple_mV' }).expect(400)).body.message).toMatch(/is in mV but limit voutV@1.5 is in V/);
    // a buck output cannot exceed its 12 V input (Erickson & Maksimović, ch. 2, M(D) = D)
    expect((await send({ high: 20 }).expect(400)).body.message).toMatch(/outside the physical range of voutV@1.5/);
    expect((await send({ low: undefined, high: undefined }).expect(400)).body.message).toMatch(/Give a low limit, a high limit or both/);
    expect((await send({ reason: '' }).expect(400)).body.message).toMatch(/reason must say why/);
    await http().post(`${ROUTE}/${demoId}/accept`).set(as(operator)).send({ ...body, planVersionId: draft.id }).expect(403);
    await http().post(`${ROUTE}/${demoId}/accept`).set(as(quality)).send({ ...body, planVersionId: draft.id }).expect(403);
    const unchanged = (await http().get(`/api/plan-versions/${draft.id}`).set(as(engineer)).expect(200)).body;
    expect(unchanged.checksum).toBe(draft.checksum);
    expect(await t.orm.em.fork().count(AuditEvent, { action: 'characterization.limits_accepted' })).toBe(eventsBefore);
  });
});
