import { MikroORM } from '@mikro-orm/core';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

/**
 * A database made by the previous release (only the initial migration applied, with runs and measurements
 * in it) upgrades with every migration and keeps its rows. Rows are written with the old release's SQL, so
 * the test does not depend on today's entities.
 */
describe('database upgrade from the previous release', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-upgrade-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('applies every migration to an old database and keeps runs, measurements and units', async () => {
    Object.assign(process.env, { DATABASE_PATH: join(dir, 'old.sqlite'), JWT_SECRET: 'test-secret-at-least-32-bytes-long-0123456789', LOG_LEVEL: 'error' });
    const { createOrmConfig } = await import('../src/mikro-orm.config');
    const orm = await MikroORM.init(createOrmConfig(join(dir, 'old.sqlite'), { debug: false }));
    try {
      const migrator = orm.getMigrator();
      await migrator.up({ to: 'Migration20261202070745' });
      const sql = (q: string, params: unknown[] = []) => orm.em.getConnection().execute(q, params);
      const t = Date.parse('2026-11-20T08:00:00Z');
      await sql(`insert into users (id, created_at, updated_at, username, display_name, password_hash, roles, active) values (1, ?, ?, 'op', 'Ada Operator', 'x', '["operator"]', 1)`, [t, t]);
      await sql(
        `insert into products (id, created_at, updated_at, part_number, name, family, vin_min_v, vin_nom_v, vin_max_v, vout_nom_v, iout_rated_a, serial_pattern, active) values (1, ?, ?, 'OB-BK0503', 'Buck', 'BK', 9, 12, 18, 5, 3, '^K5A-\\d{4}-\\d{5}$', 1)`,
        [t, t],
      );
      await sql(`insert into lots (id, created_at, updated_at, code, product_id, planned_quantity, state) values (1, ?, ?, 'LB-1', 1, 10, 'open')`, [t, t]);
      await sql(`insert into fixtures (id, created_at, updated_at, code, name, port_path, calibration_due_at) values (1, ?, ?, 'FX-1', 'Fixture 1', 'mock:FX-1', ?)`, [t, t, t + 1e10]);
      await sql(`insert into stations (id, created_at, updated_at, code, name, fixture_id, active_lot_id) values (1, ?, ?, 'EOL-1', 'Line 1', 1, 1)`, [t, t]);
      await sql(`insert into test_plans (id, created_at, updated_at, code, name, product_id) values (1, ?, ?, 'EOL-BK0503', 'End of line', 1)`, [t, t]);
      await sql(
        `insert into plan_versions (id, created_at, updated_at, plan_id, version, state, reason, steps, checksum) values (1, ?, ?, 1, 1, 'released', 'first', '[]', 'abc')`,
        [t, t],
      );
      for (const [id, serial, state, count] of [
        [1, 'K5A-2647-00001', 'passed', 1],
        [2, 'K5A-2647-00002', 'untested', 0],
      ] as const) {
        await sql(`insert into units (id, created_at, updated_at, serial, lot_id, product_id, state, test_count) values (?, ?, ?, ?, 1, 1, ?, ?)`, [id, t, t, serial, state, count]);
      }
      const run = (id: number, unit: number, verdict: string, attempt: number) =>
        sql(
          `insert into test_runs (id, created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, attempt, verdict, started_at, finished_at) ` +
            `values (?, ?, ?, ?, 1, 1, 1, 1, 1, 1, ?, ?, ?, ?)`,
          [id, t, t, unit, attempt, verdict, t + id * 1000, verdict === 'running' ? null : t + id * 1000 + 500],
        );
      await run(1, 1, 'pass', 1);
      // the old release could leave several runs of one unit `running` after crashes (issue 8 defect 1)
      await run(2, 2, 'running', 1);
      await run(3, 2, 'running', 1);
      await sql(
        `insert into measurements (id, created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, uncertainty, rule, verdict, raw, started_at, measured_at) ` +
          `values (1, ?, ?, 1, 0, 'vout', 'Output voltage', 'voutV', 'Output voltage', 5.01, 'V', 4.9, 5.1, 0.01, 'guarded', 'pass', '{"voutV":5.01}', ?, ?)`,
        [t, t, t + 1100, t + 1200],
      );
      await sql(
        `insert into measurements (id, created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, uncertainty, rule, verdict, raw, started_at, measured_at) ` +
          `values (2, ?, ?, 3, 1, 'load', 'Load step', 'undershootMv', 'Undershoot', 80, 'mV', null, 150, 0, 'simple', 'pass', null, ?, ?)`,
        [t, t, t + 3100, t + 3200],
      );

      await migrator.up();
      expect(await migrator.getPendingMigrations()).toEqual([]);

      const runs = await sql(`select id, verdict, end_reason, operator_name, error_message, finished_at from test_runs order by id`);
      expect(runs).toHaveLength(3);
      expect(runs[0]).toMatchObject({ id: 1, verdict: 'pass', end_reason: null, operator_name: 'Ada Operator' });
      // the cut-off runs are closed as interrupted (so the one-running-run index could be built)
      for (const r of runs.slice(1)) expect(r).toMatchObject({ verdict: 'error', end_reason: 'interrupted', operator_name: 'Ada Operator' });
      expect(runs[2].finished_at).toBe(t + 3200);
      const measurements = await sql(`select id, run_id, value, verdict, decision, raw from measurements order by id`);
      expect(measurements).toEqual([
        { id: 1, run_id: 1, value: 5.01, verdict: 'pass', decision: null, raw: '{"voutV":5.01}' },
        { id: 2, run_id: 3, value: 80, verdict: 'pass', decision: null, raw: null },
      ]);
      const units = await sql(`select serial, state, test_count from units order by id`);
      // each interrupted run counts as an attempt and passes nothing
      expect(units).toEqual([
        { serial: 'K5A-2647-00001', state: 'passed', test_count: 1 },
        { serial: 'K5A-2647-00002', state: 'untested', test_count: 2 },
      ]);
      // and from now on the database itself holds one running run per unit
      await run(4, 1, 'running', 2);
      await expect(run(5, 1, 'running', 2)).rejects.toThrow(/UNIQUE/);
    } finally {
      await orm.close(true);
    }
  });
});
