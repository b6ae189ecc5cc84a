import type { AbstractSqlConnection } from '@mikro-orm/knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MeasurementView, StationEventMap } from '../src/realtime/station-events';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * Issue 11: a step's measurements are one transaction (all stored or none) committed before anything about
 * them is shown, and the runs list reads only the columns it returns.
 */
describe('run store and lean run reads', () => {
  let t: TestApp;
  let h: EngineHarness;
  let stationId: number;
  const sql = (q: string, params: unknown[] = []) => t.orm.em.getConnection().execute(q, params);

  beforeAll(async () => {
    t = await createTestApp();
    h = new EngineHarness(t, await login(t.app, 'operator'));
    stationId = (await h.station('EOL-1')).id;
    await h.simulate('FX-101', { defectRates: {} });
  });
  afterAll(async () => t?.close());

  it('stores none of a step whose second measurement cannot be inserted, shows none of it, and ends the run store_failed', async () => {
    const [good, bad] = await h.freshSerials('EOL-1', 2, 50);
    const first = await h.run(stationId, good);
    expect(first.verdict).toBe('pass');
    // a step that stores two measurements or more, and the second one's quantity
    const detail = await h.detail(first.runId);
    const byStep = new Map<string, MeasurementView[]>();
    for (const m of detail.measurements as MeasurementView[]) byStep.set(m.stepKey, [...(byStep.get(m.stepKey) ?? []), m]);
    const [stepKey, rows] = [...byStep].find(([, ms]) => ms.length >= 2)!;
    const earlier = [...byStep.keys()].slice(0, [...byStep.keys()].indexOf(stepKey));
    // the disk refuses exactly that row (self-constructed failure: a trigger that aborts its INSERT; on the
    // physical values table, as `measurements` is a view since Migration20261203010000)
    await sql(
      `create trigger refuse_second before insert on measurement_values when new.def_id in ` +
        `(select id from measurement_defs where step_key = '${stepKey}' and quantity = '${rows[1].quantity}') ` +
        `begin select raise(abort, 'simulated write failure'); end`,
    );
    try {
      const r = await h.run(stationId, bad);
      expect(r.verdict).toBe('error');
      expect(r.endReason).toBe('store_failed');
      expect(r.errorMessage).toContain('simulated write failure');
      const stored = (await sql('select step_key, quantity from measurements where run_id = ?', [r.runId])) as { step_key: string }[];
      // the first measurement of that step was in the same transaction: it is not there either
      expect(stored.filter((m) => m.step_key === stepKey)).toEqual([]);
      // the steps before it are stored whole
      expect([...new Set(stored.map((m) => m.step_key))]).toEqual(earlier);
      // nothing of the failed step was shown
      const shown = h.eventsOf(r.runId).filter((e) => e.name === 'measurement:judged') as { payload: StationEventMap['measurement:judged'] }[];
      expect(shown.some((e) => e.payload.stepKey === stepKey)).toBe(false);
      expect(shown).toHaveLength(stored.length);
      const [run] = (await sql('select verdict, end_reason from test_runs where id = ?', [r.runId])) as { verdict: string; end_reason: string }[];
      expect(run).toEqual({ verdict: 'error', end_reason: 'store_failed' });
    } finally {
      await sql('drop trigger refuse_second');
    }
  });

  it('gives every measurement event the id of its committed row', async () => {
    const [serial] = await h.freshSerials('EOL-1', 1, 60);
    const r = await h.run(stationId, serial);
    const shown = h.eventsOf(r.runId).filter((e) => e.name === 'measurement:judged') as { payload: StationEventMap['measurement:judged'] }[];
    const stored = (await sql('select id, quantity, step_key from measurements where run_id = ? order by id', [r.runId])) as { id: number; quantity: string; step_key: string }[];
    expect(shown.map((e) => [e.payload.measurement.id, e.payload.stepKey, e.payload.measurement.quantity])).toEqual(stored.map((m) => [m.id, m.step_key, m.quantity]));
  });

  it('lists runs without ever reading a password hash, and counts them without joins', async () => {
    const seen: string[] = [];
    const knex = (t.orm.em.getConnection() as unknown as AbstractSqlConnection).getKnex();
    const listen = (q: { sql: string }) => seen.push(q.sql);
    knex.on('query', listen);
    try {
      const res = await h.http().get('/api/runs?limit=5').set('Authorization', `Bearer ${h.token}`).expect(200);
      expect(res.body.items.length).toBeGreaterThan(0);
      const one = await h.http().get(`/api/runs/${res.body.items[0].id}`).set('Authorization', `Bearer ${h.token}`).expect(200);
      expect(one.body.operatorName).toBeTruthy();
    } finally {
      knex.removeListener('query', listen);
    }
    const reads = seen.filter((q) => /test_runs/.test(q));
    expect(reads.length).toBeGreaterThanOrEqual(3);
    for (const q of seen) expect(q).not.toMatch(/password|users`?\.\*|select \*/i);
    const count = seen.find((q) => /count\(\*\)/i.test(q))!;
    expect(count).not.toMatch(/\bjoin\b/i);
  });

  it('finds runs by any part of the serial, in any case, and treats % and _ literally', async () => {
    const auth = { Authorization: `Bearer ${h.token}` };
    const [serial] = await h.freshSerials('EOL-1', 1, 70);
    const r = await h.run(stationId, serial);
    const part = serial.slice(-7).toLowerCase();
    const res = await h.http().get(`/api/runs?serial=${encodeURIComponent(part)}`).set(auth).expect(200);
    expect(res.body.items.map((i: { id: number }) => i.id)).toContain(r.runId);
    expect(res.body.items.every((i: { serial: string }) => i.serial.toLowerCase().includes(part))).toBe(true);
    expect(res.body.total).toBe(res.body.items.length);
    const none = await h.http().get(`/api/runs?serial=${encodeURIComponent('%')}`).set(auth).expect(200);
    expect(none.body).toEqual({ items: [], total: 0 });
  });
});
