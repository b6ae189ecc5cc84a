import { MikroORM } from '@mikro-orm/core';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { migrateDatabase } from '../src/config/migrate-on-start';

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

  // issue 11: the wide measurements table becomes the compact tables behind the `measurements` view
  it('moves measurements of every kind into the compact storage and reads every column back as stored', async () => {
    const file = join(dir, 'previous.sqlite');
    const { createOrmConfig } = await import('../src/mikro-orm.config');
    const orm = await MikroORM.init(createOrmConfig(file, { debug: false }));
    const t = Date.parse('2026-11-25T08:00:00Z');
    let before: Record<string, unknown>[];
    try {
      await orm.getMigrator().up({ to: 'Migration20261202156000' });
      const sql = (q: string, params: unknown[] = []) => orm.em.getConnection().execute(q, params);
      await sql(`insert into users (id, created_at, updated_at, username, display_name, password_hash, roles, active) values (1, ?, ?, 'op', 'Ada Operator', 'x', '["operator"]', 1)`, [t, t]);
      await sql(`insert into products (id, created_at, updated_at, part_number, name, family, vin_min_v, vin_nom_v, vin_max_v, vout_nom_v, iout_rated_a, serial_pattern, active) values (1, ?, ?, 'OB-BK0503', 'Buck', 'BK', 9, 12, 18, 5, 3, '^K5A-\\d{4}-\\d{5}$', 1)`, [t, t]);
      await sql(`insert into lots (id, created_at, updated_at, code, product_id, planned_quantity, state) values (1, ?, ?, 'LB-1', 1, 10, 'open')`, [t, t]);
      await sql(`insert into fixtures (id, created_at, updated_at, code, name, port_path, calibration_due_at) values (1, ?, ?, 'FX-1', 'Fixture 1', 'mock:FX-1', ?)`, [t, t, t + 1e10]);
      await sql(`insert into stations (id, created_at, updated_at, code, name, fixture_id, active_lot_id) values (1, ?, ?, 'EOL-1', 'Line 1', 1, 1)`, [t, t]);
      await sql(`insert into test_plans (id, created_at, updated_at, code, name, product_id) values (1, ?, ?, 'EOL-BK0503', 'End of line', 1)`, [t, t]);
      await sql(`insert into plan_versions (id, created_at, updated_at, plan_id, version, state, reason, steps, checksum) values (1, ?, ?, 1, 1, 'released', 'first', '[]', 'abc')`, [t, t]);
      for (const id of [1, 2]) {
        await sql(`insert into units (id, created_at, updated_at, serial, lot_id, product_id, state, test_count) values (?, ?, ?, ?, 1, 1, 'passed', 1)`, [id, t, t, `K5A-2648-0000${id}`]);
        await sql(
          `insert into test_runs (id, created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, operator_name, attempt, verdict, started_at, finished_at) values (?, ?, ?, ?, 1, 1, 1, 1, 1, 1, 'Ada Operator', 1, 'pass', ?, ?)`,
          [id, t, t, id, t + id * 10_000, t + id * 10_000 + 5_000],
        );
      }
      // self-constructed example rows, one of each kind the engine stores (values as the fixture returns them)
      const trace = (base: number) => Array.from({ length: 100 }, (_, i) => Number((base + Math.sin(i / 7) * 0.0123456).toFixed(5)));
      const ripple = JSON.stringify({ vinV: 12, loadA: 3, samples: 2000, sampleRateHz: 100000000, minV: 4.96885, maxV: 4.98479, meanV: 4.977110979999999, traceEvery: 20, traceV: trace(4.977) });
      const loadStep = (run: number) =>
        JSON.stringify({ vinV: 12, fromA: 0.75, toA: 2.25, stepIndex: 400, bandPct: 1, bandCentreV: 4.992369251870325, samples: 2000, traceEvery: 20, traceV: trace(4.99 + run / 1000) });
      const wide =
        'insert into measurements (id, created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, guarded_low, guarded_high, uncertainty, rule, verdict, decision, raw, started_at, measured_at) ' +
        'values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)';
      let id = 0;
      const row = (run: number, step: number, key: string, stepName: string, q: string, name: string, value: number | null, unit: string, low: number | null, high: number | null, gl: number | null, gh: number | null, u: number, rule: string, verdict: string, decision: string | null, raw: string | null) => {
        const at = t + run * 10_000 + step * 300 + 250;
        // ids with a gap (a rolled-back step of the old release leaves one), written 2 ms after the measure time
        id += id === 5 ? 3 : 1;
        return sql(wide, [id, at + 2, at + 2, run, step, key, stepName, q, name, value, unit, low, high, gl, gh, u, rule, verdict, decision, raw, at - 240, at]);
      };
      for (const run of [1, 2]) {
        await row(run, 0, 'iin-no-load', 'No-load input current', 'iinNoLoadMa', 'Input current, no load', 6.85947, 'mA', null, 15, null, 14.9, 0.1, 'guarded', 'pass', 'pass', '{"vinV":12,"iinA":0.00685947}');
        await row(run, 1, 'vout-load', 'Output under load', 'voutV@3', 'Output voltage at 3 A', run === 1 ? 4.97711 : 4.905, 'V', 4.9, 5.1, 4.91, 5.09, 0.01, 'guarded', run === 1 ? 'pass' : 'guard_fail', run === 1 ? 'pass' : 'conditional_fail', '{"vinV":12,"loadA":3,"voutV":4.97711}');
        await row(run, 2, 'ripple', 'Output ripple', 'rippleMvPp', 'Ripple', 15.94, 'mV', null, 50, null, null, 0, 'simple', 'pass', 'pass', ripple);
        for (const [q, name, unit, value] of [['undershootMv', 'Undershoot', 'mV', 146.1], ['overshootMv', 'Overshoot', 'mV', 17.4], ['recoveryUs', 'Recovery', 'us', 42]] as const)
          await row(run, 3, 'load-step', 'Load step', q, name, value, unit, null, 150, null, null, 0, 'simple', 'pass', 'pass', loadStep(run));
        // no value: the fixture gave nothing, the row says why
        await row(run, 4, 'protection', 'Overload protection', 'foldback', 'Fold-back', null, 'bool', 1, null, null, null, 0, 'simple', 'fail', null, '{"problem":"fixture returned no reading","vinV":12}');
        await row(run, 5, 'protection-old', 'Old row', 'recovered', 'Recovered', 1, 'bool', 1, null, null, null, 0, 'simple', 'pass', null, null);
      }
      // the maintenance job's ANALYZE has run on every plant database (it once stopped the upgrade)
      await sql('analyze');
      before = await sql('select *, typeof(value) as tv, typeof(raw) as tr, typeof(created_at) as tc from measurements order by id');
      expect(before).toHaveLength(16);
    } finally {
      await orm.close(true);
    }

    // the server's own start path: migrations, then the space of the old table given back
    const applied = await migrateDatabase(file);
    expect(applied).toContain('Migration20261203010000');

    const after = await MikroORM.init(createOrmConfig(file, { debug: false }));
    try {
      const sql = (q: string, params: unknown[] = []) => after.em.getConnection().execute(q, params);
      // every column of every row, with its SQLite type, as the wide table held it (raw: the same JSON text)
      expect(await sql('select *, typeof(value) as tv, typeof(raw) as tr, typeof(created_at) as tc from measurements order by id')).toEqual(before);
      // each capture once per run and step (the load step's three rows share one), each limit set once
      expect(await sql('select count(*) as n from step_captures')).toEqual([{ n: 4 }]);
      expect(await sql('select count(*) as n from measurement_defs')).toEqual([{ n: 8 }]);
      expect(await sql('select count(*) as n from measurement_values where raw is not null and capture_id is not null')).toEqual([{ n: 0 }]);
      // the free pages went back: the file holds no empty space
      expect(await sql('select freelist_count as n from pragma_freelist_count')).toEqual([{ n: 0 }]);
      // ids are never reused: the next measurement continues after the old table's counter
      const maxBefore = Math.max(...before.map((r) => Number(r.id)));
      await sql(
        'insert into measurements (created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, uncertainty, rule, verdict, decision, raw, started_at, measured_at) ' +
          "values (?, ?, 2, 6, 'extra', 'Extra', 'x', 'X', 1.5, 'V', 0, 'simple', 'pass', 'pass', '{}', ?, ?)",
        [t, t, t, t],
      );
      const [added] = await sql("select id from measurements where step_key = 'extra'");
      expect(Number(added.id)).toBe(maxBefore + 1);
      // what the old table's constraints refused is refused with a message (and times the offsets cannot hold)
      const bad = (verdict: string, decision: string | null, at: unknown) =>
        sql(
          'insert into measurements (created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, uncertainty, rule, verdict, decision, raw, started_at, measured_at) ' +
            "values (?, ?, 2, 7, 'bad', 'Bad', 'x', 'X', 1.5, 'V', 0, 'simple', ?, ?, null, ?, ?)",
          [t, t, verdict, decision, at, at],
        );
      await expect(bad('maybe', null, t)).rejects.toThrow(/verdict must be pass, fail or guard_fail/);
      await expect(bad('pass', 'likely', t)).rejects.toThrow(/decision must be empty or pass/);
      await expect(bad('pass', 'pass', '2026-11-25T08:00:00Z')).rejects.toThrow(/must be epoch milliseconds/);
      expect(await sql("select count(*) as n from measurements where step_key = 'bad'")).toEqual([{ n: 0 }]);
      // stored measurements are never changed or removed, by any path
      await expect(sql("update measurements set value = 2 where step_key = 'extra'")).rejects.toThrow(/view/);
      await expect(sql('update measurement_values set value = 2')).rejects.toThrow(/cannot be changed/);
      await expect(sql('delete from measurement_values')).rejects.toThrow(/cannot be deleted/);
      await expect(sql('delete from step_captures')).rejects.toThrow(/cannot be deleted/);
      await expect(sql('update measurement_defs set high_limit = 99')).rejects.toThrow(/cannot be changed/);
      // the RTY summary (Migration20261203020000) was filled from the moved rows and kept by the extra INSERT
      expect(await sql('select count(*) as n from run_steps where run_id = 2 and step_index = 6')).toEqual([{ n: 1 }]);
      expect(Number((await sql('select count(*) as n from run_steps'))[0].n)).toBe(
        Number((await sql('select count(*) as n from (select distinct run_id, step_index from measurements)'))[0].n),
      );
      // and back: the previous release's wide table with every row as it was (every migration of this release
      // reverted, the compact storage's last, umzug's `to` included)
      await after.getMigrator().down({ to: 'Migration20261203010000' });
      expect(await sql("select type from sqlite_master where name = 'measurements'")).toEqual([{ type: 'table' }]);
      expect(await sql("select *, typeof(value) as tv, typeof(raw) as tr, typeof(created_at) as tc from measurements where step_key <> 'extra' order by id")).toEqual(before);
    } finally {
      await after.close(true);
    }
  });
});
