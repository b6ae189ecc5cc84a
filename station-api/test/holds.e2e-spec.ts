import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { freePort } from './support/free-port';
import { HoldEvaluatorService } from '../src/holds/hold-evaluator.service';
import { MailService } from '../src/mail/mail.service';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

type Defect = 'good' | 'wrong_feedback';

/*
 * Hold rules end to end on EOL-1 (OB-BK0503, fixture FX-101, simulated at instant timing): each kind of rule
 * trips on tests driven through the REST API, the lot goes on hold, the station refuses to start with the
 * reason, the e-mail reaches the app's own capture SMTP server and the outbox; quality lifts the hold with a
 * reason (audited) and the rules then look only at tests after the lift.
 */
describe('holds and alerts', () => {
  let t: TestApp;
  let h: EngineHarness;
  let stationId: number;
  let productId: number;
  let lotCode: string;
  let serials: string[];
  let next = 0;
  const tokens: Record<string, string> = {};

  const http = () => request(t.app.getHttpServer());
  const as = (user: string) => ({ Authorization: `Bearer ${tokens[user]}` });
  const evaluator = () => t.app.get(HoldEvaluatorService);
  const mail = () => t.app.get(MailService);

  beforeAll(async () => {
    t = await createTestApp({ MAIL_CAPTURE: '1', MAIL_CAPTURE_PORT: '0', MAIL_RETRY_DELAY_MS: '10' });
    for (const u of ['operator', 'engineer', 'quality', 'admin']) tokens[u] = await login(t.app, u);
    h = new EngineHarness(t, tokens.operator);
    const station = await h.station('EOL-1');
    stationId = station.id;
    productId = station.activeLot!.product.id;
    lotCode = station.activeLot!.code;
    serials = await h.freshSerials('EOL-1', 80);
  });
  afterAll(async () => t?.close());

  /** Tests units with the given defects, one after another, and waits for the rules to be judged. */
  async function testUnits(defects: Defect[]): Promise<number[]> {
    const picked = defects.map((d) => ({ serial: serials[next++], d }));
    await h.simulate('FX-101', { defectRates: {}, serials: Object.fromEntries(picked.map((p) => [p.serial, p.d])) });
    const runIds: number[] = [];
    for (const p of picked) runIds.push((await h.run(stationId, p.serial)).runId);
    await evaluator().idle();
    return runIds;
  }

  async function addRule(body: Record<string, unknown>, user = 'engineer') {
    const res = await http().post('/api/hold-rules').set(as(user)).send({ productId, ...body });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body as { id: number; description: string };
  }

  async function activeHold() {
    const res = await http().get('/api/holds?state=active').set(as('quality')).expect(200);
    return res.body as { id: number; lotCode: string; reason: string; runId: number; figures: Record<string, unknown>; ruleId: number }[];
  }

  async function lift(holdId: number) {
    await http().post(`/api/holds/${holdId}/lift`).set(as('quality')).send({ reason: 'Cause found and fixed; testing may go on' }).expect(200);
  }

  async function switchOff(ruleId: number) {
    await http().patch(`/api/hold-rules/${ruleId}`).set(as('engineer')).send({ active: false }).expect(200);
  }

  it('refuses rules a person must correct, field by field', async () => {
    const bad = await http().post('/api/hold-rules').set(as('engineer')).send({ productId, kind: 'fpy', windowUnits: 3, minFpyPct: 120 }).expect(400);
    expect(bad.body.details.map((d: { field: string }) => d.field).sort()).toEqual(['minFpyPct', 'windowUnits']);
    expect(bad.body.message).toContain('windowUnits must be from 10 to 1000');
    const step = await http().post('/api/hold-rules').set(as('quality')).send({ productId, kind: 'cpk', windowUnits: 30, minCpk: 1.33, stepKey: 'nope', quantity: 'voutV' }).expect(400);
    expect(step.body.message).toContain('step "nope" is not in the released plan of OB-BK0503');
    const missing = await http().post('/api/hold-rules').set(as('engineer')).send({ productId, kind: 'consecutive_failures' }).expect(400);
    expect(missing.body.message).toContain('failuresInRow is required');
    await http().post('/api/hold-rules').set(as('engineer')).send({ productId: 9999, kind: 'consecutive_failures', failuresInRow: 3 }).expect(400);
    await http().post('/api/hold-rules').set(as('operator')).send({ productId, kind: 'consecutive_failures', failuresInRow: 3 }).expect(403);
    const choices = await http().get(`/api/hold-rules/quantities?productId=${productId}`).set(as('engineer')).expect(200);
    expect(choices.body).toContainEqual(expect.objectContaining({ stepKey: 'vout-no-load', quantity: 'voutV', hasLimits: true }));
  });

  it('K failures in a row: holds the lot, blocks the station, mails quality, and only quality lifts it (audited)', async () => {
    const rule = await addRule({ kind: 'consecutive_failures', failuresInRow: 2 });
    const [, tripping] = await testUnits(['wrong_feedback', 'wrong_feedback']);

    const [hold] = await activeHold();
    expect(hold).toMatchObject({ lotCode, ruleId: rule.id, runId: tripping, reason: '2 failed tests in a row at station EOL-1' });

    // the station refuses to start, with the reason
    const status = await http().get(`/api/stations/${stationId}/status`).set(as('operator')).expect(200);
    expect(status.body.state).toBe('blocked');
    expect(status.body.reasons).toContain(`Lot ${lotCode} is on hold: 2 failed tests in a row at station EOL-1`);
    const refused = await http().post(`/api/stations/${stationId}/runs`).set(as('operator')).send({ serial: serials[next], safetyConfirmed: true }).expect(409);
    expect(JSON.stringify(refused.body)).toContain(`Lot ${lotCode} is on hold: 2 failed tests in a row at station EOL-1`);
    // the live state was announced without anyone asking
    expect(h.events.some((e) => e.name === 'station:state' && (e.payload as { reasons: string[] }).reasons.some((r) => r.includes('is on hold')))).toBe(true);

    // the e-mail reached the local capture server, addressed to the quality user
    const received = await mail().capture.waitFor((m) => m.subject.includes(lotCode));
    expect(received.to).toEqual(['quality@orrinbay.example']);
    expect(received.subject).toBe(`Lot ${lotCode} (OB-BK0503) is on hold`);
    expect(received.text).toContain('Reason: 2 failed tests in a row at station EOL-1');
    await mail().idle();
    const outbox = await http().get('/api/outbox').set(as('quality')).expect(200);
    expect(outbox.body[0]).toMatchObject({ to: 'quality@orrinbay.example', subject: `Lot ${lotCode} (OB-BK0503) is on hold`, status: 'sent', attempts: 1 });
    const alerts = await http().get('/api/hold-alerts').set(as('engineer')).expect(200);
    expect(alerts.body[0]).toMatchObject({ kind: 'hold', lotCode, runId: tripping, holdId: hold.id, ruleId: rule.id });

    // lifting: not for engineers or operators, never without a reason
    await http().post(`/api/holds/${hold.id}/lift`).set(as('engineer')).send({ reason: 'I think it is fine' }).expect(403);
    await http().post(`/api/holds/${hold.id}/lift`).set(as('operator')).send({ reason: 'I think it is fine' }).expect(403);
    const noReason = await http().post(`/api/holds/${hold.id}/lift`).set(as('quality')).send({}).expect(400);
    expect(JSON.stringify(noReason.body)).toContain('reason is required');
    await http().post(`/api/holds/${hold.id}/lift`).set(as('quality')).send({ reason: '   ' }).expect(400);
    const lifted = await http().post(`/api/holds/${hold.id}/lift`).set(as('quality')).send({ reason: 'Feedback resistors of reel 7 replaced' }).expect(200);
    expect(lifted.body).toMatchObject({ lotState: 'open', liftedByName: 'Quality engineer', liftReason: 'Feedback resistors of reel 7 replaced' });
    await http().post(`/api/holds/${hold.id}/lift`).set(as('quality')).send({ reason: 'again please' }).expect(409);

    const audit = await http().get('/api/audit?entityType=hold').set(as('quality')).expect(200);
    const liftEvent = audit.body.items.find((e: { action: string }) => e.action === 'hold.lifted');
    expect(liftEvent).toMatchObject({
      entityId: String(hold.id),
      reason: 'Feedback resistors of reel 7 replaced',
      before: { lotState: 'on_hold', holdReason: '2 failed tests in a row at station EOL-1' },
      after: { lotState: 'open' },
    });
    expect(audit.body.items.find((e: { action: string }) => e.action === 'hold.placed')).toMatchObject({ after: { lotState: 'on_hold', runId: tripping } });
    const ruleAudit = await http().get('/api/audit?entityType=hold_rule').set(as('quality')).expect(200);
    expect(ruleAudit.body.items.some((e: { action: string; entityId: string }) => e.action === 'hold_rule.created' && e.entityId === String(rule.id))).toBe(true);

    const after = await http().get(`/api/stations/${stationId}/status`).set(as('operator')).expect(200);
    expect(after.body.reasons.join(' ')).not.toContain('on hold');

    // after the lift the rule starts afresh: one more failure is not two in a row
    await testUnits(['wrong_feedback']);
    expect(await activeHold()).toEqual([]);
    await switchOff(rule.id);
    const rules = await http().get(`/api/hold-rules?productId=${productId}`).set(as('quality')).expect(200);
    expect(rules.body.find((r: { id: number }) => r.id === rule.id)).toMatchObject({ active: false });
  });

  it('FPY of the last N units below X %: holds on the unit that brings it below', async () => {
    // nine good units (no FPY rule yet), then the rule, then a failing unit: the last 10 units hold 9 first passes
    await testUnits(Array<Defect>(9).fill('good'));
    const rule = await addRule({ kind: 'fpy', windowUnits: 10, minFpyPct: 95 }, 'quality');
    const runs = await testUnits(['wrong_feedback']);
    const [hold] = await activeHold();
    // 9 of 10 passed the first time: 90 %
    expect(hold).toMatchObject({ ruleId: rule.id, runId: runs[runs.length - 1], reason: 'First-pass yield of the last 10 units 90.0 % (below 95 %)' });
    expect(hold.figures).toMatchObject({ units: 10, passedFirstTime: 9 });
    await lift(hold.id);
    await switchOff(rule.id);
  });

  it('Cpk of a quantity below Y over the last N tests', async () => {
    const rule = await addRule({ kind: 'cpk', windowUnits: 20, minCpk: 1.33, stepKey: 'vout-no-load', quantity: 'voutV' });
    const runs = await testUnits([...Array<Defect>(19).fill('good'), 'wrong_feedback']);
    const [hold] = await activeHold();
    expect(hold).toMatchObject({ ruleId: rule.id, runId: runs[19] });
    expect(hold.reason).toMatch(/^Cpk of .+ over the last 20 tests \d+\.\d\d \(below 1\.33\)$/);
    expect(hold.figures.cpk as number).toBeLessThan(1.33);
    await lift(hold.id);
    await switchOff(rule.id);
  });

  it('a control-chart run-rule violation on a quantity', async () => {
    const rule = await addRule({ kind: 'run_rule', windowUnits: 10, stepKey: 'vout-no-load', quantity: 'voutV' });
    const runs = await testUnits([...Array<Defect>(9).fill('good'), 'wrong_feedback']);
    const [hold] = await activeHold();
    expect(hold).toMatchObject({ ruleId: rule.id, runId: runs[9] });
    expect(hold.reason).toMatch(/^Control-chart signal on .+ over the last 10 tests: WE1, point 10 is more than 3 σ (above|below) the centre line$/);
    await lift(hold.id);
    await switchOff(rule.id);
    // every hold was mailed and is in the outbox
    await mail().idle();
    const outbox = await http().get('/api/outbox').set(as('engineer')).expect(200);
    expect(outbox.body.filter((m: { status: string }) => m.status === 'sent')).toHaveLength(4);
  });

  it('an evaluation that fails is logged and kept as an alert; the run is unaffected', async () => {
    const rule = await addRule({ kind: 'consecutive_failures', failuresInRow: 2 });
    const spy = vi.spyOn(evaluator() as unknown as { judge: () => Promise<unknown> }, 'judge').mockRejectedValueOnce(new Error('simulated database hiccup'));
    const [runId] = await testUnits(['good']);
    spy.mockRestore();
    expect((await h.detail(runId)).verdict).toBe('pass');
    const alerts = await http().get('/api/hold-alerts').set(as('quality')).expect(200);
    expect(alerts.body[0]).toMatchObject({ kind: 'evaluation_failed', runId, message: `Hold rules could not be evaluated after run ${runId}: simulated database hiccup` });
    expect(await activeHold()).toEqual([]);
    await switchOff(rule.id);
  });
});

describe('outbox when the mail server cannot be reached', () => {
  let t: TestApp;

  beforeAll(async () => {
    // a port nobody listens on: every attempt is refused
    t = await createTestApp({ MAIL_CAPTURE: '0', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(await freePort()), MAIL_ATTEMPTS: '3', MAIL_RETRY_DELAY_MS: '10' });
  });
  afterAll(async () => t?.close());

  it('retries, then marks the message failed with the error, shown in the outbox', async () => {
    const mail = t.app.get(MailService);
    const em = t.orm.em.fork();
    const [queued] = mail.queue(em as never, [{ to: 'quality@orrinbay.example', subject: 'Lot LB-TEST is on hold', body: 'test' }]);
    await em.flush();
    mail.deliverQueued([queued]);
    await mail.idle();
    const token = await login(t.app, 'quality');
    const res = await request(t.app.getHttpServer()).get('/api/outbox').set('Authorization', `Bearer ${token}`).expect(200);
    expect(res.body[0]).toMatchObject({ to: 'quality@orrinbay.example', status: 'failed', attempts: 3, sentAt: null });
    expect(res.body[0].lastError).toMatch(/ECONNREFUSED|connect/i);
  });
});
