import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import { canonicalJson, DEFAULT_PLANS_DIR, parsePlanText } from '../src/plans/plan-file';
import { PlanVersion } from '../src/plans/plan-version.entity';
import { createTestApp, login, TestApp } from './create-test-app';

describe('plan versions: lifecycle, roles, comparison, plan files', () => {
  let t: TestApp;
  let engineer: string;
  let engineer2: string;
  let admin: string;
  let operator: string;
  let quality: string;
  const http = () => request(t.app.getHttpServer());
  const as = (token: string) => ({ Authorization: `Bearer ${token}` });

  beforeAll(async () => {
    t = await createTestApp();
    [engineer, engineer2, admin, operator, quality] = await Promise.all(['engineer', 'engineer2', 'admin', 'operator', 'quality'].map((u) => login(t.app, u)));
  });
  afterAll(async () => t?.close());

  async function planFor(partNumber: string) {
    const res = await http().get('/api/plans').set(as(operator)).expect(200);
    return res.body.find((p: { product: { partNumber: string } }) => p.product.partNumber === partNumber);
  }

  async function newDraft(partNumber: string, token = engineer) {
    const plan = await planFor(partNumber);
    const res = await http().post(`/api/plan-versions/${plan.releasedVersion.id}/drafts`).set(as(token)).send({ reason: 'Limit review' }).expect(201);
    return { plan, draft: res.body };
  }

  it('serves the step-kind registry with units, bounds and physical ranges', async () => {
    const res = await http().get('/api/plan-step-kinds').set(as(operator)).expect(200);
    const ripple = res.body.find((k: { kind: string }) => k.kind === 'ripple');
    expect(ripple.params.find((p: { name: string }) => p.name === 'settleMs')).toMatchObject({ unit: 'ms', schema: { type: 'integer', minimum: 0, maximum: 60000 } });
    expect(ripple.quantities[0]).toMatchObject({ base: 'rippleMvPp', unit: 'mV', limitKey: 'rippleMvPp' });
    expect(res.body.find((k: { kind: string }) => k.kind === 'vout_at_load').quantities[0].limitKey).toBe('voutV@<load>');
  });

  it('lets an operator (and quality) read plans but never change them', async () => {
    const plan = await planFor('OB-BK0503');
    const id = plan.releasedVersion.id;
    for (const token of [operator, quality]) {
      await http().post(`/api/plan-versions/${id}/drafts`).set(as(token)).send({ reason: 'try' }).expect(403);
      await http().patch(`/api/plan-versions/${id}`).set(as(token)).send({ maxAttempts: 2 }).expect(403);
      await http().post(`/api/plan-versions/${id}/submit`).set(as(token)).send({ reason: 'try' }).expect(403);
      await http().post(`/api/plan-versions/${id}/release`).set(as(token)).send({ reason: 'try' }).expect(403);
      await http().post(`/api/plan-versions/${id}/retire`).set(as(token)).send({ reason: 'try' }).expect(403);
      await http().post('/api/plans/import').set(as(token)).attach('file', Buffer.from('x'), 'x.plan.yaml').expect(403);
    }
    await http().get(`/api/plan-versions/${id}/export`).set(as(operator)).expect(200);
  });

  it('edits a draft, submits it with a reason and refuses the author as approver', async () => {
    const { plan, draft } = await newDraft('OB-BK0503');
    expect(draft).toMatchObject({ state: 'draft', stage: 'draft', version: plan.versionCount + 1, checksum: plan.releasedVersion.checksum });
    const steps = structuredClone(draft.steps);
    steps[2].limits[0].high = 5.08;
    const edited = await http().patch(`/api/plan-versions/${draft.id}`).set(as(engineer)).send({ steps }).expect(200);
    expect(edited.body.steps[2].limits[0].high).toBe(5.08);
    expect(edited.body.checksum).not.toBe(draft.checksum);

    // release before submission, submission without a reason
    const early = await http().post(`/api/plan-versions/${draft.id}/release`).set(as(engineer2)).send({ reason: 'looks fine' }).expect(409);
    expect(early.body.details.code).toBe('not_submitted');
    const noReason = await http().post(`/api/plan-versions/${draft.id}/submit`).set(as(engineer)).send({}).expect(400);
    expect(noReason.body.details[0].field).toBe('reason');

    const submitted = await http().post(`/api/plan-versions/${draft.id}/submit`).set(as(engineer)).send({ reason: 'vout high limit 5.08 V' }).expect(200);
    expect(submitted.body).toMatchObject({ stage: 'submitted', changeReason: 'vout high limit 5.08 V', submittedBy: { username: 'engineer' } });

    const own = await http().post(`/api/plan-versions/${draft.id}/release`).set(as(engineer)).send({ reason: 'self' }).expect(403);
    expect(own.body.message).toMatch(/nobody releases their own change/);
    expect(own.body.details.code).toBe('own_change');

    // an edit withdraws the submission, and an engineer who edited may not approve either
    await http().patch(`/api/plan-versions/${draft.id}`).set(as(engineer2)).send({ maxAttempts: 2 }).expect(200);
    const withdrawn = await http().get(`/api/plan-versions/${draft.id}`).set(as(operator)).expect(200);
    expect(withdrawn.body.stage).toBe('draft');
    await http().post(`/api/plan-versions/${draft.id}/submit`).set(as(engineer)).send({ reason: 'vout high 5.08 V, two attempts' }).expect(200);
    const editor = await http().post(`/api/plan-versions/${draft.id}/release`).set(as(engineer2)).send({ reason: 'looks fine' }).expect(403);
    expect(editor.body.details.code).toBe('own_change');

    // admin may do what engineers may, and is a second person here
    const released = await http().post(`/api/plan-versions/${draft.id}/release`).set(as(admin)).send({ reason: 'Reviewed' }).expect(200);
    expect(released.body).toMatchObject({ state: 'released', stage: 'released', releasedBy: { username: 'admin' }, maxAttempts: 2 });

    const actions = (await t.orm.em.fork().find(AuditEvent, { entityType: 'plan_version', entityId: String(draft.id) }, { orderBy: { id: 'asc' } })).map((a) => a.action);
    expect(actions).toEqual(['plan_version.created', 'plan_version.edited', 'plan_version.submitted', 'plan_version.edited', 'plan_version.submitted', 'plan_version.released']);
    const edit = await t.orm.em.fork().findOneOrFail(AuditEvent, { entityId: String(draft.id), action: 'plan_version.edited' }, { orderBy: { id: 'asc' } });
    expect(edit.after).toMatchObject({ changes: [{ step: 'vout-load', field: 'limits[voutV@1.5].high', before: 5.1, after: 5.08 }] });
  });

  it('refuses every change to a released version with 409 and keeps it when retired', async () => {
    const plan = await planFor('OB-BK1202');
    const id = plan.releasedVersion.id;
    const tries = [
      http().patch(`/api/plan-versions/${id}`).set(as(engineer)).send({ maxAttempts: 2 }),
      http().put(`/api/plan-versions/${id}`).set(as(engineer)).send({ reason: 'change it' }),
      http().delete(`/api/plan-versions/${id}`).set(as(engineer)).send({ reason: 'remove it' }),
      http().post(`/api/plan-versions/${id}/submit`).set(as(engineer)).send({ reason: 'again' }),
      http().post(`/api/plan-versions/${id}/release`).set(as(engineer2)).send({ reason: 'again' }),
    ];
    for (const res of await Promise.all(tries)) {
      expect(res.status).toBe(409);
      expect(res.body.details.code).toBe('not_draft');
      expect(res.body.message).toMatch(/released; only a draft can/);
    }
    const retired = await http().post(`/api/plan-versions/${id}/retire`).set(as(engineer)).send({ reason: 'Product end of life' }).expect(200);
    expect(retired.body).toMatchObject({ stage: 'retired', retireReason: 'Product end of life', retiredBy: { username: 'engineer' }, state: 'released' });
    await http().post(`/api/plan-versions/${id}/retire`).set(as(engineer)).send({ reason: 'again' }).expect(409);
    await http().patch(`/api/plan-versions/${id}`).set(as(engineer)).send({ maxAttempts: 2 }).expect(409);
    // kept, readable, no longer what stations run; a new draft can start from it
    const after = await planFor('OB-BK1202');
    expect(after.releasedVersion).toBeNull();
    const kept = await http().get(`/api/plan-versions/${id}`).set(as(operator)).expect(200);
    expect(kept.body.steps).toHaveLength(9);
    const revived = await http().post(`/api/plan-versions/${id}/drafts`).set(as(engineer)).send({ reason: 'Product back in production' }).expect(201);
    expect(revived.body.checksum).toBe(kept.body.checksum);
  });

  it('discards a draft but never a released version', async () => {
    const { draft } = await newDraft('OB-BK3305');
    await http().delete(`/api/plan-versions/${draft.id}`).set(as(engineer)).send({ reason: 'Not needed' }).expect(204);
    expect(await t.orm.em.fork().count(PlanVersion, { id: draft.id })).toBe(0);
    const audit = await t.orm.em.fork().findOneOrFail(AuditEvent, { action: 'plan_version.discarded', entityId: String(draft.id) });
    expect(audit.reason).toBe('Not needed');
  });

  it('compares two versions: added, removed, reordered steps and each changed value', async () => {
    const { plan, draft } = await newDraft('OB-BK3305');
    const steps = structuredClone(draft.steps);
    const [ripple] = steps.splice(6, 1); // remove ripple
    steps[1].params.settleMs = 80; // vout-no-load settle time
    steps[2].limits[1].low = 3.25; // voutV@<full load>
    [steps[3], steps[4]] = [steps[4], steps[3]]; // swap load and line regulation
    steps.push({ ...ripple, key: 'ripple-light', name: 'Ripple at light load', params: { ...ripple.params, loadA: 1 } });
    await http().patch(`/api/plan-versions/${draft.id}`).set(as(engineer)).send({ steps, maxAttempts: 2 }).expect(200);
    const res = await http().get(`/api/plan-versions/${plan.releasedVersion.id}/compare/${draft.id}`).set(as(operator)).expect(200);
    const old = draft.steps;
    expect(res.body).toMatchObject({
      fromVersion: plan.releasedVersion.version,
      identical: false,
      added: [{ key: 'ripple-light', position: 9 }],
      removed: [{ key: 'ripple', position: 7 }],
      reordered: [
        { key: old[4].key, from: 5, to: 4 },
        { key: old[3].key, from: 4, to: 5 },
      ],
      settings: [{ field: 'maxAttempts', before: 3, after: 2 }],
    });
    expect(res.body.changed).toEqual([
      { key: old[1].key, name: old[1].name, kind: old[1].kind, changes: [{ field: 'params.settleMs', before: old[1].params.settleMs, after: 80 }] },
      { key: old[2].key, name: old[2].name, kind: old[2].kind, changes: [{ field: `limits[${old[2].limits[1].key}].low`, before: old[2].limits[1].low, after: 3.25 }] },
    ]);
    const same = await http().get(`/api/plan-versions/${plan.releasedVersion.id}/compare/${plan.releasedVersion.id}`).set(as(operator)).expect(200);
    expect(same.body.identical).toBe(true);
    const other = await planFor('OB-BK0503');
    await http().get(`/api/plan-versions/${plan.releasedVersion.id}/compare/${other.releasedVersion.id}`).set(as(operator)).expect(400);
  });

  it('previews a draft: every problem on its field and the guarded limits from the stated uncertainty', async () => {
    const plan = await planFor('OB-BK0503');
    const v = await http().get(`/api/plan-versions/${plan.releasedVersion.id}`).set(as(engineer)).expect(200);
    const steps = structuredClone(v.body.steps);
    Object.assign(steps[2].limits[0], { low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' });
    const ok = await http().post(`/api/plans/${plan.id}/preview`).set(as(engineer)).send({ steps }).expect(200);
    expect(ok.body.valid).toBe(true);
    // voutV@1.5: 4.9 … 5.1 V, U = 0.01 V, guarded → 4.91 … 5.09 V (ILAC-G8:09/2019 §4.2.2, w = U)
    const vout = ok.body.limits.find((l: { stepIndex: number; limitIndex: number }) => l.stepIndex === 2 && l.limitIndex === 0);
    expect(vout.acceptLow).toBeCloseTo(4.91, 12);
    expect(vout.acceptHigh).toBeCloseTo(5.09, 12);

    steps[2].limits[0].low = 5.2; // low above high
    steps[2].params.loadsA = [1.5, 3.5]; // above the 3 A rating
    steps[0].params.vinV = 30; // above the 18 V input maximum
    steps[1].params.settleMs = 120000; // above 60 s
    steps[6].params.samples = 4; // below 16
    const bad = await http().post(`/api/plans/${plan.id}/preview`).set(as(engineer)).send({ steps }).expect(200);
    expect(bad.body.valid).toBe(false);
    const fields = bad.body.problems.map((p: { field: string }) => p.field).sort();
    expect(fields).toEqual(['steps[1].params.settleMs', 'steps[6].params.samples']);
    // the schema pass stops before the cross-field pass: fix those, then the rest shows, each on its field
    steps[1].params.settleMs = 100;
    steps[6].params.samples = 2000;
    const cross = await http().post(`/api/plans/${plan.id}/preview`).set(as(engineer)).send({ steps }).expect(200);
    const byField = Object.fromEntries(cross.body.problems.map((p: { field: string; problems: string[] }) => [p.field, p.problems.join(' ')]));
    expect(byField['steps[2].limits[0].high']).toMatch(/must be above low \(5.2\)/);
    expect(byField['steps[2].params.loadsA[1]']).toMatch(/3.5 A is above the rated output current of OB-BK0503 \(3 A\)/);
    expect(byField['steps[0].params.vinV']).toMatch(/30 V is outside the input range of OB-BK0503 \(9–18 V\)/);

    // guarded zone closed by the uncertainty
    const zone = structuredClone(v.body.steps);
    zone[2].limits[0].uncertainty = 0.1;
    const closed = await http().post(`/api/plans/${plan.id}/preview`).set(as(engineer)).send({ steps: zone }).expect(200);
    expect(closed.body.problems).toEqual([{ field: 'steps[2].limits[0].uncertainty', problems: [expect.stringMatching(/closes the acceptance zone/)] }]);
    expect(closed.body.limits.find((l: { stepIndex: number; limitIndex: number }) => l.stepIndex === 2 && l.limitIndex === 0)).toMatchObject({ acceptLow: null, acceptHigh: null, problem: expect.stringMatching(/closes the acceptance zone/) });
  });

  it('round-trips every file in test-plans/: export(import(file)) has the same content', async () => {
    const files = readdirSync(DEFAULT_PLANS_DIR).filter((n) => n.endsWith('.plan.yaml'));
    expect(files.length).toBeGreaterThanOrEqual(3);
    for (const name of files) {
      const text = readFileSync(join(DEFAULT_PLANS_DIR, name), 'utf8');
      const imported = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from(text), name).expect(201);
      expect(imported.body).toMatchObject({ state: 'draft', sourceFile: name });
      const exported = await http().get(`/api/plan-versions/${imported.body.id}/export`).set(as(engineer)).expect(200);
      expect(exported.headers['content-disposition']).toMatch(/attachment; filename="EOL-BK\d{4}-v\d+\.plan\.yaml"/);
      const original = parsePlanText(text, name);
      const back = parsePlanText(exported.text, 'exported');
      expect(back.issues).toEqual([]);
      expect(back.plan!.header).toEqual(original.plan!.header);
      expect(canonicalJson(back.plan!.steps)).toBe(canonicalJson(original.plan!.steps));
      expect(back.plan!.checksum).toBe(original.plan!.checksum);
      expect(imported.body.checksum).toBe(original.plan!.checksum);
      // and exporting the re-imported export gives the very same text
      const again = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from(exported.text), 'exported.plan.yaml').expect(201);
      const twice = await http().get(`/api/plan-versions/${again.body.id}/export`).set(as(engineer)).expect(200);
      expect(twice.text.replace(/v\d+/g, '')).toBe(exported.text.replace(/v\d+/g, ''));
    }
  });

  it('refuses a bad plan file whole, naming field and line, and changes nothing', async () => {
    const count = async () => t.orm.em.fork().count(PlanVersion, {});
    const before = await count();
    const good = readFileSync(join(DEFAULT_PLANS_DIR, 'OB-BK0503.plan.yaml'), 'utf8');
    const lines = good.split('\n');
    const bad = good.replace('high: 30', 'high: thirty').replace('params: { vinV: 12, settleMs: 50 }', 'params: { vinV: 12, settleMs: 50, bogus: 1 }');
    const res = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from(bad), 'bad.plan.yaml').expect(400);
    const rippleLine = bad.split('\n').findIndex((l) => l.includes('high: thirty')) + 1;
    expect(res.body.message).toMatch(/^bad.plan.yaml was not imported, nothing changed/);
    expect(res.body.details).toContainEqual({ field: 'steps[6].limits[0].high', line: rippleLine, column: 15, message: 'must be a number' });
    expect(res.body.details.some((d: { field: string; line: number }) => d.field === 'steps[0].params.bogus' && d.line === lines.findIndex((l) => l.includes('vinV: 12, settleMs: 50')) + 1)).toBe(true);

    const cross = good.replace('high: 30', 'low: 40\n        high: 30');
    const crossRes = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from(cross), 'cross.plan.yaml').expect(400);
    expect(crossRes.body.details).toEqual([{ field: 'steps[6].limits[0].high', line: cross.split('\n').findIndex((l) => l.includes('low: 40')) + 2, column: 15, message: 'must be above low (40); got high 30' }]);

    const syntax = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from('format: [\n'), 'broken.plan.yaml').expect(400);
    expect(syntax.body.details[0]).toMatchObject({ field: '(syntax)', line: expect.any(Number) });
    const empty = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.alloc(0), 'empty.plan.yaml').expect(400);
    expect(empty.body.details[0].message).toBe('the file is empty');
    const latin1 = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from([0x66, 0x6f, 0xe9, 0x0a]), 'latin.plan.yaml').expect(400);
    expect(latin1.body.details[0].message).toMatch(/not UTF-8/);
    const unknownPlan = good.replace('planCode: EOL-BK0503', 'planCode: EOL-NOPE');
    const unknown = await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.from(unknownPlan), 'nope.plan.yaml').expect(400);
    expect(unknown.body.details[0]).toMatchObject({ field: 'header.planCode', line: 7 });
    await http().post('/api/plans/import').set(as(engineer)).send({}).expect(400);
    await http().post('/api/plans/import').set(as(engineer)).attach('file', Buffer.alloc(600 * 1024, 0x20), 'huge.plan.yaml').expect(413);
    expect(await count()).toBe(before);
  });
});
