import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import { Measurement } from '../src/runs/measurement.entity';
import { TestRun } from '../src/runs/test-run.entity';
import { Unit } from '../src/units/unit.entity';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * The repair loop against the real engine and simulated fixture: a unit with a wrong feedback divider fails
 * up to its retest limit, goes through repair and comes back with a fresh set of attempts.
 */
describe('repair: POST /api/units/:serial/repair', () => {
  let t: TestApp;
  let h: EngineHarness;
  const tokens: Record<string, string> = {};
  let eol1: number;
  let maxAttempts: number;
  let badSerial: string;
  let scrapSerial: string;
  let goodSerial: string;
  const auth = (role: string) => ({ Authorization: `Bearer ${tokens[role]}` });

  const scan = (serial: string) => h.http().post(`/api/stations/${eol1}/scan`).set(auth('operator')).send({ serial });
  const repair = (serial: string, body: Record<string, unknown>, role = 'engineer') =>
    h.http().post(`/api/units/${encodeURIComponent(serial)}/repair`).set(auth(role)).send(body);
  const unitRow = (serial: string) => t.orm.em.fork().findOneOrFail(Unit, { serial });
  // issue 12: returning for retest and scrapping need a repair record (symptom, cause, action taken)
  let causeId: number;
  const record = (symptom: string, actionTaken: string) => ({ symptom, causeId, actionTaken });

  beforeAll(async () => {
    t = await createTestApp();
    for (const role of ['operator', 'engineer', 'quality', 'admin']) tokens[role] = await login(t.app, role);
    h = new EngineHarness(t, tokens.operator);
    eol1 = (await h.station('EOL-1')).id;
    [badSerial, scrapSerial, goodSerial] = await h.freshSerials('EOL-1', 3);
    // per-serial defect, everything else good (as the floor and engine tests do)
    await h.simulate('FX-101', { defectRates: {}, serials: { [badSerial]: 'wrong_feedback', [scrapSerial]: 'wrong_feedback' } });
    maxAttempts = (await scan(badSerial).expect(200)).body.plan.maxAttempts;
    expect(maxAttempts).toBeGreaterThanOrEqual(1);
    causeId = (await h.http().get('/api/repair-causes').set(auth('engineer')).expect(200)).body[0].id;
  });
  afterAll(async () => t?.close());

  it('fails a unit up to the retest limit, then scan refuses it with retest_limit', async () => {
    for (let i = 1; i <= maxAttempts; i++) {
      const r = await h.run(eol1, badSerial);
      expect(r.verdict).toBe('fail');
      expect((await h.detail(r.runId)).attempt).toBe(i);
    }
    const refused = await scan(badSerial).expect(409);
    expect(refused.body.details).toMatchObject({ code: 'retest_limit', testCount: maxAttempts, maxAttempts });
  });

  it('lists the failed unit in the repair queue as waiting (state failed)', async () => {
    const q = (await h.http().get('/api/repair-queue').set(auth('engineer')).expect(200)).body;
    expect(q.items.find((i: { serial: string }) => i.serial === badSerial)).toMatchObject({ state: 'failed', reason: 'no_attempts_left', testCount: maxAttempts });
  });

  it('refuses the operator role with 403 and changes nothing', async () => {
    const res = await repair(badSerial, { action: 'receive', note: 'bench 2' }, 'operator').expect(403);
    expect(res.body.statusCode).toBe(403);
    await h.http().post(`/api/units/${badSerial}/repair`).send({ action: 'receive', note: 'bench 2' }).expect(401);
    expect((await unitRow(badSerial)).state).toBe('failed');
  });

  it('refuses a missing or too short note and an unknown action with 400 naming the field', async () => {
    const missing = await repair(badSerial, { action: 'receive' }).expect(400);
    expect(missing.body.details).toEqual([{ field: 'note', problems: expect.arrayContaining(['note must be 3 to 500 characters']) }]);
    expect(missing.body.message).toContain('note');
    const blank = await repair(badSerial, { action: 'receive', note: '   ' }).expect(400);
    expect(blank.body.details[0].field).toBe('note');
    const long = await repair(badSerial, { action: 'receive', note: 'x'.repeat(501) }).expect(400);
    expect(long.body.details[0].field).toBe('note');
    const action = await repair(badSerial, { action: 'fix', note: 'bench 2' }).expect(400);
    expect(action.body.details).toEqual([{ field: 'action', problems: ['action must be one of receive, return, scrap'] }]);
    const extra = await repair(badSerial, { action: 'receive', note: 'bench 2', state: 'passed' }).expect(400);
    expect(extra.body.message).toContain('Unknown field "state"');
    expect((await unitRow(badSerial)).state).toBe('failed');
  });

  it('refuses an unknown serial with 404', async () => {
    const res = await repair('K5A-2648-99998', { action: 'receive', note: 'bench 2' }).expect(404);
    expect(res.body.details.code).toBe('unknown_serial');
  });

  it('refuses a transition the state does not allow with 409 bad_repair_transition, naming the state and what is allowed', async () => {
    const res = await repair(badSerial, { action: 'return', note: 'looks fine', ...record('none seen', 'none') }).expect(409);
    expect(res.body.details).toEqual({ code: 'bad_repair_transition', state: 'failed', allowed: ['receive', 'scrap'] });
    expect(res.body.message).toMatch(/is failed and waiting for repair, so it cannot be returned for retest\. .*receive it into repair or scrap it/);
    const untested = await repair(goodSerial, { action: 'scrap', note: 'dropped', ...record('dropped', 'none') }, 'quality').expect(409);
    expect(untested.body.details).toMatchObject({ code: 'bad_repair_transition', state: 'untested', allowed: [] });
  });

  it('receives the unit: in_repair, shown in the queue, refused at scan as "in repair"', async () => {
    const res = await repair(badSerial, { action: 'receive', note: '  on bench 2, Vout high  ' }).expect(200);
    expect(res.body).toMatchObject({ action: 'receive', fromState: 'failed', toState: 'in_repair', unit: { serial: badSerial, state: 'in_repair' } });
    const refused = await scan(badSerial).expect(409);
    expect(refused.body.details.code).toBe('unit_not_testable');
    expect(refused.body.message).toContain('in repair');
    const q = (await h.http().get('/api/repair-queue').set(auth('operator')).expect(200)).body;
    expect(q.items.find((i: { serial: string }) => i.serial === badSerial)).toMatchObject({ state: 'in_repair' });
    // receiving twice is not a transition
    expect((await repair(badSerial, { action: 'receive', note: 'again' }).expect(409)).body.details.allowed).toEqual(['return', 'scrap']);
  });

  it('returns the unit for retest with a fresh set of attempts; run attempts keep counting globally; runs are untouched', async () => {
    const em = t.orm.em.fork();
    const unit = await unitRow(badSerial);
    const runsBefore = await em.find(TestRun, { unit: unit.id }, { orderBy: { id: 'asc' } });
    const measurementsBefore = await em.count(Measurement, { run: { $in: runsBefore.map((r) => r.id) } });

    const res = await repair(badSerial, { action: 'return', note: 'replaced R12 feedback divider', ...record('Vout high', 'replaced R12') }, 'admin').expect(200);
    expect(res.body).toMatchObject({ fromState: 'in_repair', toState: 'untested', unit: { state: 'untested', testCount: maxAttempts } });
    expect(await unitRow(badSerial)).toMatchObject({ testCountAtReturn: maxAttempts });

    const ok = await scan(badSerial).expect(200);
    expect(ok.body.attempt).toBe(maxAttempts + 1);
    // the simulator still has the defect, so the retest fails: the attempt number is global n+1
    const r = await h.run(eol1, badSerial);
    expect(r.verdict).toBe('fail');
    expect((await h.detail(r.runId)).attempt).toBe(maxAttempts + 1);
    // one attempt used of the fresh set: another retest is allowed unless the plan allows only one
    if (maxAttempts > 1) expect((await scan(badSerial).expect(200)).body.attempt).toBe(maxAttempts + 2);

    const em2 = t.orm.em.fork();
    const runsAfter = await em2.find(TestRun, { id: { $in: runsBefore.map((x) => x.id) } }, { orderBy: { id: 'asc' } });
    expect(runsAfter.map((x) => [x.id, x.attempt, x.verdict, x.finishedAt?.getTime()])).toEqual(
      runsBefore.map((x) => [x.id, x.attempt, x.verdict, x.finishedAt?.getTime()]),
    );
    expect(await em2.count(Measurement, { run: { $in: runsBefore.map((x) => x.id) } })).toBe(measurementsBefore);
  });

  it('counts the retest limit from the return: after maxAttempts more failures the unit is refused again', async () => {
    for (let i = 2; i <= maxAttempts; i++) expect((await h.run(eol1, badSerial)).verdict).toBe('fail');
    const refused = await scan(badSerial).expect(409);
    expect(refused.body.details).toMatchObject({ code: 'retest_limit', testCount: 2 * maxAttempts, attemptsUsed: maxAttempts, maxAttempts });
    expect(refused.body.message).toContain('since it came back from repair');
  });

  it('scraps a failed unit (quality); the scan refuses it as scrapped and nothing moves it on', async () => {
    expect((await h.run(eol1, scrapSerial)).verdict).toBe('fail');
    const res = await repair(scrapSerial, { action: 'scrap', note: 'cracked inductor, not worth rework', ...record('Vout high', 'none, scrapped') }, 'quality').expect(200);
    expect(res.body).toMatchObject({ fromState: 'failed', toState: 'scrapped' });
    const refused = await scan(scrapSerial).expect(409);
    expect(refused.body.details.code).toBe('unit_not_testable');
    expect(refused.body.message).toContain('scrapped');
    const again = await repair(scrapSerial, { action: 'return', note: 'try again', ...record('again', 'again') }).expect(409);
    expect(again.body).toMatchObject({ details: { code: 'bad_repair_transition', state: 'scrapped', allowed: [] } });
    expect(again.body.message).toMatch(/stays scrapped/);
    const q = (await h.http().get('/api/repair-queue').set(auth('operator')).expect(200)).body;
    expect(q.items.map((i: { serial: string }) => i.serial)).not.toContain(scrapSerial);
  });

  it('writes one audit event per transition with before/after state, the note as reason and the actor', async () => {
    const em = t.orm.em.fork();
    const bad = await unitRow(badSerial);
    const events = await em.find(AuditEvent, { entityType: 'unit', entityId: String(bad.id) }, { orderBy: { id: 'asc' }, populate: ['actor'] });
    expect(events.map((e) => [e.action, e.before?.state, e.after?.state, e.reason, e.actor?.username])).toEqual([
      ['unit.repair_received', 'failed', 'in_repair', 'on bench 2, Vout high', 'engineer'],
      ['unit.repair_returned', 'in_repair', 'untested', 'replaced R12 feedback divider', 'admin'],
    ]);
    expect(events[1].after).toMatchObject({ serial: badSerial, testCount: maxAttempts, testCountAtReturn: maxAttempts });
    const scrap = await unitRow(scrapSerial);
    const scrapEvents = await em.find(AuditEvent, { entityType: 'unit', entityId: String(scrap.id) });
    expect(scrapEvents.map((e) => [e.action, e.before?.state, e.after?.state, e.reason])).toEqual([
      ['unit.scrapped', 'failed', 'scrapped', 'cracked inductor, not worth rework'],
    ]);
    // refused requests leave no trace
    expect(await em.count(AuditEvent, { action: { $like: 'unit.%' } })).toBe(3);
  });
});

/**
 * Retest policy (issue 8; interfaces decision 9): after a FAIL with attempts left the unit stays `failed`
 * and off the repair queue; it goes there when no attempts are left or when the operator sends it.
 */
describe('retest policy: POST /api/units/:serial/send-to-repair', () => {
  let t: TestApp;
  let h: EngineHarness;
  const tokens: Record<string, string> = {};
  let eol1: number;
  let failedOnce: string;
  let passed: string;
  const auth = (role: string) => ({ Authorization: `Bearer ${tokens[role]}` });
  const send = (serial: string, body: Record<string, unknown> = {}, role = 'operator') =>
    h.http().post(`/api/units/${encodeURIComponent(serial)}/send-to-repair`).set(auth(role)).send(body);
  const queue = async () => (await h.http().get('/api/repair-queue').set(auth('engineer')).expect(200)).body.items as { serial: string; reason: string; sentToRepairAt: string | null }[];

  beforeAll(async () => {
    t = await createTestApp();
    for (const role of ['operator', 'engineer', 'quality', 'admin']) tokens[role] = await login(t.app, role);
    h = new EngineHarness(t, tokens.operator);
    eol1 = (await h.station('EOL-1')).id;
    [failedOnce, passed] = await h.freshSerials('EOL-1', 2);
    await h.simulate('FX-101', { defectRates: {}, serials: { [failedOnce]: 'wrong_feedback' } });
    expect((await h.run(eol1, failedOnce)).verdict).toBe('fail');
    expect((await h.run(eol1, passed)).verdict).toBe('pass');
  });
  afterAll(async () => t?.close());

  it('keeps a unit that failed with attempts left off the repair queue', async () => {
    expect((await unitOf(t, failedOnce)).state).toBe('failed');
    expect((await queue()).map((i) => i.serial)).not.toContain(failedOnce);
  });

  it('refuses roles other than operator, engineer and admin, a note that is too long, and units that did not fail', async () => {
    await send(failedOnce, {}, 'quality').expect(403);
    await h.http().post(`/api/units/${failedOnce}/send-to-repair`).send({}).expect(401);
    const long = await send(failedOnce, { note: 'x'.repeat(501) }).expect(400);
    expect(JSON.stringify(long.body)).toMatch(/note must be at most 500 characters/);
    const notFailed = await send(passed).expect(409);
    expect(notFailed.body.details).toMatchObject({ code: 'not_failed', state: 'passed' });
    expect(notFailed.body.message).toBe(`${passed} cannot be sent to repair: it passed its test. Only a failed unit goes to repair.`);
    const unknown = await send('K5A-0000-99999').expect(404);
    expect(unknown.body.details.code).toBe('unknown_serial');
    expect((await unitOf(t, failedOnce)).sentToRepairAt ?? null).toBeNull();
  });

  it('sends it to repair (200 with the unit), lists it as sent by the operator, and audits it with the note', async () => {
    const res = await send(failedOnce, { note: '  Output high again after re-seating  ' }).expect(200);
    expect(res.body).toMatchObject({ serial: failedOnce, state: 'failed', testCount: 1 });
    expect(Date.parse(res.body.sentToRepairAt)).toBeGreaterThan(Date.now() - 60_000);
    const item = (await queue()).find((i) => i.serial === failedOnce);
    expect(item).toMatchObject({ reason: 'sent_by_operator', sentToRepairAt: res.body.sentToRepairAt });
    // a second send (double click) changes nothing and writes nothing
    const again = await send(failedOnce, {}, 'engineer').expect(200);
    expect(again.body.sentToRepairAt).toBe(res.body.sentToRepairAt);
    const unit = await unitOf(t, failedOnce);
    const events = await t.orm.em.fork().find(AuditEvent, { entityType: 'unit', entityId: String(unit.id) }, { populate: ['actor'] });
    expect(events.map((e) => [e.action, e.reason, e.actor?.username, e.after?.sentToRepairAt])).toEqual([
      ['unit.sent_to_repair', 'Output high again after re-seating', 'operator', res.body.sentToRepairAt],
    ]);
  });

  it('clears the mark when repair returns the unit for retest', async () => {
    const repair = (body: Record<string, unknown>) => h.http().post(`/api/units/${failedOnce}/repair`).set(auth('engineer')).send(body);
    await repair({ action: 'receive', note: 'on the bench' }).expect(200);
    expect((await queue()).find((i) => i.serial === failedOnce)?.reason).toBe('in_repair');
    const causeId = (await h.http().get('/api/repair-causes').set(auth('engineer')).expect(200)).body[0].id;
    const back = await repair({ action: 'return', note: 'replaced the feedback divider', symptom: 'Vout high', causeId, actionTaken: 'replaced R12' }).expect(200);
    expect(back.body.unit).toMatchObject({ state: 'untested', sentToRepairAt: null });
    expect((await queue()).map((i) => i.serial)).not.toContain(failedOnce);
  });
});

function unitOf(t: TestApp, serial: string): Promise<Unit> {
  return t.orm.em.fork().findOneOrFail(Unit, { serial });
}
