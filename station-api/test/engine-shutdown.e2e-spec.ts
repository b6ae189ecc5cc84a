import sqlite3 from 'sqlite3';
import { describe, expect, it } from 'vitest';
import { createTestApp, login } from './create-test-app';
import { EngineHarness } from './engine-helpers';

// its own file: each test file gets its own server and database
describe('run engine at server shutdown', () => {
  it('aborts a running test and leaves the fixture safe when the server stops', async () => {
    const t = await createTestApp();
    let closed = false;
    try {
      const h = new EngineHarness(t, await login(t.app, 'operator'));
      const s = await h.station('EOL-1');
      const serial = (await h.freshSerials('EOL-1', 1))[0];
      // realistic timing: the run is still going when the server is told to stop
      const sim = await h.simulate('FX-101', { defectRates: {} }, 'realistic');
      const reached = new Promise<void>((resolve) => h.engine.onStepStarting((_r, _k, i) => i === 2 && resolve()));
      const start = await h.http().post(`/api/stations/${s.id}/runs`).set('Authorization', `Bearer ${h.token}`).send({ serial, safetyConfirmed: true }).expect(201);
      await reached;
      const finished = h.finished(start.body.run.id);
      await t.app.close();
      expect((await finished).verdict).toBe('aborted');
      // the verdict reached the database before it closed
      const db = new sqlite3.Database(t.dbPath);
      const row = await new Promise<{ verdict: string }>((resolve, reject) =>
        db.get('select verdict from test_runs where id = ?', [start.body.run.id], (err: Error | null, r: { verdict: string }) => (err ? reject(err) : resolve(r))),
      );
      await new Promise((resolve) => db.close(resolve));
      await t.close();
      closed = true;
      expect(row.verdict).toBe('aborted');
      expect(sim.simulator.state()).toMatchObject({ sourceOn: false, loadOn: false });
      expect(sim.log).toContain('LOAD OFF');
    } finally {
      if (!closed) await t.close();
    }
  });
});
