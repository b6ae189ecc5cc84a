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
      const f = await finished;
      // issue 8 defect 7: a shutdown is not an operator stop
      expect(f).toMatchObject({ verdict: 'aborted', endReason: 'server_shutdown', errorMessage: 'Stopped: station server shut down' });
      // the verdict reached the database before it closed
      const db = new sqlite3.Database(t.dbPath);
      type Row = { verdict: string; end_reason: string; error_message: string };
      const row = await new Promise<Row>((resolve, reject) =>
        db.get('select verdict, end_reason, error_message from test_runs where id = ?', [start.body.run.id], (err: Error | null, r: Row) =>
          err ? reject(err) : resolve(r),
        ),
      );
      await new Promise((resolve) => db.close(resolve));
      await t.close();
      closed = true;
      expect(row).toEqual({ verdict: 'aborted', end_reason: 'server_shutdown', error_message: 'Stopped: station server shut down' });
      expect(sim.simulator.state()).toMatchObject({ sourceOn: false, loadOn: false });
      expect(sim.log).toContain('LOAD OFF');
    } finally {
      if (!closed) await t.close();
    }
  });
});
