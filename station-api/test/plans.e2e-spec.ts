import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import { DEFAULT_PLANS_DIR } from '../src/plans/plan-file';
import { PlanVersion, PlanVersionState } from '../src/plans/plan-version.entity';
import { PlansService } from '../src/plans/plans.service';
import { Product } from '../src/products/product.entity';
import { createTestApp, login, TestApp } from './create-test-app';

describe('plans API', () => {
  let t: TestApp;
  let engineer: string;
  let engineer2: string;
  let operator: string;
  const http = () => request(t.app.getHttpServer());
  const as = (token: string) => ({ Authorization: `Bearer ${token}` });

  beforeAll(async () => {
    t = await createTestApp();
    engineer = await login(t.app, 'engineer');
    engineer2 = await login(t.app, 'engineer2');
    operator = await login(t.app, 'operator');
  });
  afterAll(async () => t?.close());

  async function planFor(partNumber: string) {
    const res = await http().get('/api/plans').set(as(operator)).expect(200);
    return res.body.find((p: { product: { partNumber: string } }) => p.product.partNumber === partNumber);
  }

  it('lists one released plan per demo product, seeded from test-plans/', async () => {
    const res = await http().get('/api/plans').set(as(operator)).expect(200);
    expect(res.body.map((p: { code: string }) => p.code)).toEqual(['EOL-BK0503', 'EOL-BK1202', 'EOL-BK3305']);
    for (const p of res.body) {
      expect(p.releasedVersion).toMatchObject({ version: 1, state: 'released', maxAttempts: 3, stepCount: 9 });
      expect(p.releasedVersion.checksum).toMatch(/^[0-9a-f]{64}$/);
      expect(p.releasedVersion.sourceFile).toBe(`${p.product.partNumber}.plan.yaml`);
    }
  });

  it('needs a token', async () => {
    await http().get('/api/plans').expect(401);
  });

  it('seeding again adds nothing (idempotent)', async () => {
    const { DatabaseSeeder } = await import('../src/database/seeders/DatabaseSeeder');
    const before = await t.orm.em.fork().count(PlanVersion, {});
    await t.orm.getSeeder().seed(DatabaseSeeder);
    expect(await t.orm.em.fork().count(PlanVersion, {})).toBe(before);
  });

  it('gives a plan with its versions and a version with its steps', async () => {
    const summary = await planFor('OB-BK0503');
    const plan = await http().get(`/api/plans/${summary.id}`).set(as(operator)).expect(200);
    expect(plan.body.versions).toHaveLength(1);
    const version = await http().get(`/api/plan-versions/${plan.body.versions[0].id}`).set(as(operator)).expect(200);
    expect(version.body.plan).toMatchObject({ code: 'EOL-BK0503', product: { partNumber: 'OB-BK0503' } });
    expect(version.body.steps[2].limits[0]).toEqual({ key: 'voutV@1.5', name: 'Output voltage at 1.5 A', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' });
    await http().get('/api/plans/99999').set(as(operator)).expect(404);
  });

  it('creates a draft, releases it, and the previous released version becomes superseded', async () => {
    const summary = await planFor('OB-BK3305');
    const v1 = await http().get(`/api/plan-versions/${summary.releasedVersion.id}`).set(as(engineer)).expect(200);
    const steps = structuredClone(v1.body.steps);
    // tighten the ripple limit
    steps[6].limits[0].high = 20;
    const draft = await http()
      .post(`/api/plans/${summary.id}/versions`)
      .set(as(engineer))
      .send({ steps, stopAtFirstFailure: true, maxAttempts: 2, reason: 'Tighter ripple limit after the capacitor change' })
      .expect(201);
    expect(draft.body).toMatchObject({ version: 2, state: 'draft', stopAtFirstFailure: true, maxAttempts: 2, createdBy: { username: 'engineer' } });
    expect(draft.body.checksum).not.toBe(v1.body.checksum);

    // still the old version until released
    expect((await planFor('OB-BK3305')).releasedVersion.version).toBe(1);
    const service = t.app.get(PlansService);
    const product = await t.orm.em.fork().findOneOrFail(Product, { partNumber: 'OB-BK3305' });
    expect((await service.releasedVersionForProduct(product.id))?.version).toBe(1);

    await http().post(`/api/plan-versions/${draft.body.id}/submit`).set(as(engineer)).send({ reason: 'Ripple limit 20 mV after the capacitor change' }).expect(200);
    // a second engineer releases it (the author may not)
    const released = await http()
      .post(`/api/plan-versions/${draft.body.id}/release`)
      .set(as(engineer2))
      .send({ reason: 'Approved by the line B review' })
      .expect(200);
    expect(released.body).toMatchObject({ version: 2, state: 'released', releasedBy: { username: 'engineer2' }, submittedBy: { username: 'engineer' } });

    const plan = await http().get(`/api/plans/${summary.id}`).set(as(operator)).expect(200);
    expect(plan.body.versions.map((v: { version: number; state: string }) => [v.version, v.state])).toEqual([
      [2, 'released'],
      [1, 'superseded'],
    ]);
    expect(plan.body.releasedVersion.version).toBe(2);
    const forEngine = await service.releasedVersionForProduct(product.id, t.orm.em.fork());
    expect(forEngine).toMatchObject({ version: 2, state: PlanVersionState.Released, plan: { code: 'EOL-BK3305' } });

    // the superseded version kept its steps and checksum
    const old = await http().get(`/api/plan-versions/${v1.body.id}`).set(as(operator)).expect(200);
    expect(old.body.steps).toEqual(v1.body.steps);
    expect(old.body.checksum).toBe(v1.body.checksum);

    const audit = await t.orm.em.fork().find(AuditEvent, { action: 'plan_version.released', entityId: String(draft.body.id) });
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ reason: 'Approved by the line B review', after: { version: 2, superseded: [1] } });
  });

  it('refuses a draft with bad limits, naming the field', async () => {
    const summary = await planFor('OB-BK1202');
    const v1 = await http().get(`/api/plan-versions/${summary.releasedVersion.id}`).set(as(engineer)).expect(200);
    const steps = structuredClone(v1.body.steps);
    steps[3].limits[0].low = 2;
    steps[5].limits[0].high = 'ninety';
    const res = await http().post(`/api/plans/${summary.id}/versions`).set(as(engineer)).send({ steps, stopAtFirstFailure: false, maxAttempts: 3, reason: 'Try' }).expect(400);
    expect(res.body).toMatchObject({ statusCode: 400, error: 'Bad Request', details: [{ field: 'steps[5].limits[0].high', problems: ['must be a number'] }] });

    steps[5].limits[0].high = 99;
    const again = await http().post(`/api/plans/${summary.id}/versions`).set(as(engineer)).send({ steps, stopAtFirstFailure: false, maxAttempts: 3, reason: 'Try' }).expect(400);
    expect(again.body.details).toEqual([{ field: 'steps[3].limits[0].high', problems: ['must be above low (2); got high 1'] }]);
    expect(again.body.message).toBe('steps[3].limits[0].high: must be above low (2); got high 1');

    // a load above the 2 A rating of OB-BK1202
    steps[3].limits[0].low = -0.5;
    steps[4].params.loadA = 2.5;
    const rating = await http().post(`/api/plans/${summary.id}/versions`).set(as(engineer)).send({ steps, stopAtFirstFailure: false, maxAttempts: 3, reason: 'Try' }).expect(400);
    expect(rating.body.details).toEqual([{ field: 'steps[4].params.loadA', problems: ['2.5 A is above the rated output current of OB-BK1202 (2 A)'] }]);

    // the request itself: reason missing, unknown field
    const dto = await http().post(`/api/plans/${summary.id}/versions`).set(as(engineer)).send({ steps: v1.body.steps, stopAtFirstFailure: false, maxAttempts: 3, extra: 1 }).expect(400);
    expect(dto.body.details.map((d: { field: string }) => d.field).sort()).toEqual(['extra', 'reason']);
    expect(await t.orm.em.fork().count(PlanVersion, { plan: summary.id })).toBe(1);
  });

  it('keeps released versions immutable', async () => {
    const summary = await planFor('OB-BK0503');
    const id = summary.releasedVersion.id;
    const res = await http().post(`/api/plan-versions/${id}/release`).set(as(engineer)).send({ reason: 'Again' }).expect(409);
    expect(res.body).toMatchObject({ details: { code: 'not_draft', state: 'released' } });
    // every route that changes a version refuses a released one
    await http().patch(`/api/plan-versions/${id}`).set(as(engineer)).send({ maxAttempts: 5 }).expect(409);
    await http().put(`/api/plan-versions/${id}`).set(as(engineer)).send({ maxAttempts: 5 }).expect(409);
    // and the entity refuses a change made in code
    const em = t.orm.em.fork();
    const v = await em.findOneOrFail(PlanVersion, id);
    v.steps = [];
    await expect(em.flush()).rejects.toThrow(/is released and cannot change \(steps\)/);
    const stored = await t.orm.em.fork().findOneOrFail(PlanVersion, id);
    expect(stored.steps).toHaveLength(9);
  });

  it('lets only engineers create and release versions', async () => {
    const summary = await planFor('OB-BK0503');
    await http().post(`/api/plans/${summary.id}/versions`).set(as(operator)).send({ steps: [], stopAtFirstFailure: false, maxAttempts: 3, reason: 'nope' }).expect(403);
    await http().post(`/api/plan-versions/${summary.releasedVersion.id}/release`).set(as(operator)).send({ reason: 'nope' }).expect(403);
  });

  it('validates the YAML text of a plan file and reports lines', async () => {
    const good = readFileSync(join(DEFAULT_PLANS_DIR, 'OB-BK0503.plan.yaml'), 'utf8');
    const ok = await http().post('/api/plans/validate').set(as(engineer)).send({ text: good }).expect(200);
    expect(ok.body).toMatchObject({ valid: true, errors: [], plan: { planCode: 'EOL-BK0503', partNumber: 'OB-BK0503', stepCount: 9 } });

    const bad = good.replace('high: 30', 'high: lots').replace('vinsV: [9, 12, 18]', 'vinsV: [9, 12, 24]');
    const res = await http().post('/api/plans/validate').set(as(engineer)).send({ text: bad }).expect(200);
    expect(res.body.valid).toBe(false);
    const line = bad.split('\n').findIndex((l) => l.includes('high: lots')) + 1;
    expect(res.body.errors).toEqual([{ path: 'steps[6].limits[0].high', line, column: 15, message: 'must be a number' }]);

    const syntax = await http().post('/api/plans/validate').set(as(engineer)).send({ text: 'steps: [' }).expect(200);
    expect(syntax.body.errors[0]).toMatchObject({ path: '(syntax)', line: 1 });
    await http().post('/api/plans/validate').set(as(engineer)).send({}).expect(400);
  });

  it('answers a YAML alias bomb with a plan problem, not a 500', async () => {
    // ten levels of ten aliases each would expand to 10^10 nodes
    const levels = 'abcdefghij'.split('');
    const text = ['a: &a [x, x, x, x, x, x, x, x, x, x]', ...levels.slice(1).map((k, i) => `${k}: &${k} [${Array(10).fill(`*${levels[i]}`).join(', ')}]`)].join('\n');
    const res = await http().post('/api/plans/validate').set(as(engineer)).send({ text }).expect(200);
    expect(res.body).toMatchObject({ valid: false, errors: [{ path: '(syntax)', message: expect.stringMatching(/YAML aliases expand too far/) }] });
  });
});
