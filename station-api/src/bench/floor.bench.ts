/**
 * Floor benchmark: `npm run bench:floor -w station-api` (after `npm run build`). A script, not a timed test.
 *
 * Builds a year of one line's history on a temporary SQLite file (default 100,000 runs, ~1.3 million
 * measurements; see floor-bench-build.ts), starts the real Nest application on it (its start-up refreshes
 * the planner statistics), then times each floor question through the services the HTTP routes call —
 * runs list (unfiltered, by lot, by station, by verdict, by partial serial), one run, the board, the shift
 * summary, the repair queue — and the same question answered with hand-written SQL on the same file and
 * connection. Prints p50 / p95 of each, the ratio service / SQL, the same figures without planner statistics
 * (so a plan made worse by ANALYZE shows), and the database bytes per measurement.
 * Every timed region is one complete answer (SQL executed, rows read, objects built); nothing is cached
 * between repetitions except SQLite's page cache (warm cache, as on a running server).
 * Options: --runs <n> (default 100000), --reps <n> (default 30), --db <file> (time a file kept by
 * `bench:yield --keep` instead of building one; the same builder made it).
 */
import 'reflect-metadata';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { describeStorageSize, measurementStorageSize } from '../runs/measurement-storage-size';
import { ms, quantile } from './bench-stats';

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(name);
  const v = i > 0 ? Number(process.argv[i + 1]) : fallback;
  if (!Number.isInteger(v) || v < 1) throw new Error(`${name} must be a whole number of 1 or more`);
  return v;
}

async function timeIt(reps: number, fn: (i: number) => Promise<unknown>): Promise<{ p50: number; p95: number }> {
  for (let i = 0; i < 3; i++) await fn(i);
  const xs: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    await fn(i);
    xs.push(performance.now() - t0);
  }
  xs.sort((a, b) => a - b);
  return { p50: quantile(xs, 0.5), p95: quantile(xs, 0.95) };
}

async function main(): Promise<void> {
  const runTarget = arg('--runs', 100_000);
  const reps = arg('--reps', 30);
  const reuse = process.argv.indexOf('--db') > 0 ? process.argv[process.argv.indexOf('--db') + 1] : undefined;
  const dir = reuse ? undefined : mkdtempSync(join(tmpdir(), 'railwright-floor-'));
  const dbPath = reuse ?? join(dir!, 'floor.sqlite');
  Object.assign(process.env, {
    DATABASE_PATH: dbPath,
    SEED_HISTORY: '0',
    FIXTURE_SIM_TIMING: 'instant',
    LOG_LEVEL: 'error',
    UI_DIST: '',
    JWT_SECRET: process.env.JWT_SECRET ?? 'floor-bench-secret-0123456789-0123456789',
  });
  const log = (s: string) => console.log(s);
  try {
    const { MikroORM } = await import('@mikro-orm/sqlite');
    const { createOrmConfig } = await import('../mikro-orm.config');
    const { buildHistory, describeHistory } = await import('./floor-bench-build');
    let built;
    if (reuse) built = await describeHistory(reuse);
    else {
      const buildOrm = await MikroORM.init(createOrmConfig(dbPath));
      try {
        built = await buildHistory(buildOrm, runTarget, log);
      } finally {
        await buildOrm.close(true);
      }
    }
    const bytes = statSync(dbPath).size;

    const { NestFactory } = await import('@nestjs/core');
    const { AppModule } = await import('../app.module');
    const { RunsService } = await import('../runs/runs.service');
    const { BoardService } = await import('../board/board.service');
    const { ShiftSummaryService } = await import('../shift/shift-summary.service');
    const { RepairQueueService } = await import('../repair/repair-queue.service');
    const { RUN_VIEW_SELECT } = await import('../runs/run-queries');
    const { DatabaseMaintenanceService } = await import('../database/maintenance/database-maintenance.service');
    const app = await NestFactory.createApplicationContext(AppModule, { logger: ['error'] });
    try {
      const { MikroORM: CoreOrm } = await import('@mikro-orm/core');
      const orm = app.get(CoreOrm);
      const conn = orm.em.getConnection();
      const sql = (q: string, p: unknown[] = []) => conn.execute(q, p) as Promise<Record<string, unknown>[]>;
      const runs = app.get(RunsService);
      const board = app.get(BoardService);
      const shifts = app.get(ShiftSummaryService);
      const repair = app.get(RepairQueueService);
      const lot = built.lots[Math.floor(built.lots.length / 2)];
      const station = built.stations[0];
      const stationIds = (await sql('select id from stations where active = 1 order by code')).map((r) => Number(r.id));
      const [{ serial }] = await sql('select serial from units where lot_id = ? order by id limit 1 offset 123', [lot.id]);
      const serialPart = String(serial).slice(-9).toLowerCase();
      const runIds = (await sql('select id from test_runs order by random() limit 50')).map((r) => Number(r.id));
      const [{ id: quantityRun }] = await sql("select id from test_runs where verdict = 'pass' order by id desc limit 1");
      const [q] = await sql('select step_key, quantity from measurements where run_id = ? and value is not null order by id limit 1', [quantityRun]);
      const window = shifts.currentShift();
      const runList = (where: string, p: unknown[]) => async () => {
        await sql(`${RUN_VIEW_SELECT}${where} order by r.started_at desc, r.id desc limit 50 offset 0`, p);
        await sql(`select count(*) as total from test_runs r${where}`, p);
      };
      const like = `%${serialPart}%`;
      const questions: { name: string; service: (i: number) => Promise<unknown>; sql: (i: number) => Promise<unknown> }[] = [
        { name: 'runs list, unfiltered', service: () => runs.list({}), sql: runList('', []) },
        { name: 'runs list, by lot', service: () => runs.list({ lotId: lot.id }), sql: runList(' where r.lot_id = ?', [lot.id]) },
        { name: 'runs list, by station', service: () => runs.list({ stationId: station.id }), sql: runList(' where r.station_id = ?', [station.id]) },
        { name: 'runs list, by verdict (fail)', service: () => runs.list({ verdict: 'fail' }), sql: runList(" where r.verdict = 'fail'", []) },
        {
          name: `runs list, by serial part "${serialPart}"`,
          service: () => runs.list({ serial: serialPart }),
          sql: runList(' where r.unit_id in (select id from units where serial like ?)', [like]),
        },
        {
          name: 'one run with its measurements',
          service: (i) => runs.get(runIds[i % runIds.length]),
          sql: async (i) => {
            await sql(`${RUN_VIEW_SELECT.replace(' from test_runs r ', ', pv.steps from test_runs r ')} where r.id = ?`, [runIds[i % runIds.length]]);
            await sql('select * from measurements where run_id = ? order by step_index, id', [runIds[i % runIds.length]]);
          },
        },
        {
          name: 'board (all active stations)',
          service: () => board.snapshot(),
          sql: async () => {
            await sql('select s.*, f.code as fixture_code, l.code as lot_code, p.part_number from stations s left join fixtures f on f.id = s.fixture_id left join lots l on l.id = s.active_lot_id left join products p on p.id = l.product_id where s.active = 1 order by s.code');
            for (const id of stationIds) {
              await sql(
                "select r.id, u.serial, r.verdict, r.failed_step_key, r.finished_at from test_runs r join units u on u.id = r.unit_id where r.station_id = ? and r.verdict <> 'running' and r.finished_at is not null order by r.finished_at desc, r.id desc limit 8",
                [id],
              );
            }
            await sql(`select station_id, unit_id, attempt, verdict, finished_at from test_runs where station_id in (${stationIds.map(() => '?').join(', ')}) and finished_at >= ? and finished_at < ?`, [
              ...stationIds,
              window.start.getTime(),
              window.end.getTime(),
            ]);
          },
        },
        {
          name: 'shift summary (one station)',
          service: () => shifts.forStation(station.id),
          sql: () => sql('select unit_id, attempt, verdict, finished_at from test_runs where station_id = ? and finished_at >= ? and finished_at < ?', [station.id, window.start.getTime(), window.end.getTime()]),
        },
        {
          name: 'repair queue',
          service: () => repair.list({}),
          sql: () =>
            sql(
              "select u.id, u.serial, u.state, u.test_count, l.code, p.part_number, r.id as run_id, r.attempt, r.failed_step_key, r.finished_at, s.code as station_code, " +
                "(select m.step_key || ' ' || m.quantity || ' ' || ifnull(m.value, '') from measurements m where m.run_id = r.id and m.verdict <> 'pass' order by m.step_index, m.id limit 1) as first_failure " +
                "from units u join lots l on l.id = u.lot_id join products p on p.id = u.product_id " +
                "left join test_runs r on r.id = (select r2.id from test_runs r2 where r2.unit_id = u.id and r2.verdict = 'fail' order by r2.finished_at desc, r2.id desc limit 1) " +
                "left join stations s on s.id = r.station_id where u.state in ('failed', 'in_repair') order by r.finished_at, u.id limit 200",
            ),
        },
      ];
      // yield questions (SQL only; the statistics must not make them worse)
      const yieldSql: { name: string; run: () => Promise<unknown> }[] = [
        { name: 'COUNT of all runs', run: () => sql('select count(*) from test_runs r') },
        {
          name: `lot mean and sd of ${q.quantity}`,
          run: () =>
            sql('select count(*), avg(m.value), avg(m.value * m.value) from measurements m join test_runs r on r.id = m.run_id where r.lot_id = ? and m.step_key = ? and m.quantity = ?', [lot.id, q.step_key, q.quantity]),
        },
        {
          name: `trend of ${q.quantity}, last 30 days`,
          run: () => sql('select measured_at, value from measurements where step_key = ? and quantity = ? and measured_at >= ? order by measured_at', [q.step_key, q.quantity, Date.now() - 30 * 86400_000]),
        },
        { name: 'first-pass yield by lot (one lot)', run: () => sql("select count(*), sum(verdict = 'pass') from test_runs where lot_id = ? and attempt = 1", [lot.id]) },
      ];

      // each question is timed without planner statistics, then with them (the server's own refresh), in
      // turn, so both see the same machine load and the same page cache
      const maintenance = app.get(DatabaseMaintenanceService);
      const statsOff = async () => {
        await sql('delete from sqlite_stat1');
        // a schema change makes the connection reload its (now empty) statistics
        await sql('create table bench_reload (x integer)');
        await sql('drop table bench_reload');
      };
      type Times = { service?: { p50: number; p95: number }; sql: { p50: number; p95: number } };
      const withStats = new Map<string, Times>();
      const withoutStats = new Map<string, Times>();
      const all = [
        ...questions,
        ...yieldSql.map((y) => ({ name: y.name, service: undefined as undefined | ((i: number) => Promise<unknown>), sql: y.run })),
      ];
      for (const qn of all) {
        await statsOff();
        withoutStats.set(qn.name, { service: qn.service ? await timeIt(reps, qn.service) : undefined, sql: await timeIt(reps, qn.sql) });
        await maintenance.refresh('bench');
        withStats.set(qn.name, { service: qn.service ? await timeIt(reps, qn.service) : undefined, sql: await timeIt(reps, qn.sql) });
      }
      const t0 = performance.now();
      await maintenance.refresh('bench');
      const refreshMs = performance.now() - t0;

      const [{ n: measurementCount }] = await sql('select count(*) as n from measurements');
      let tableBytes: number | undefined;
      try {
        const [{ b }] = await sql("select sum(pgsize) as b from dbstat where name = 'measurements' or tbl_name = 'measurements'");
        tableBytes = Number(b);
      } catch {
        tableBytes = undefined;
      }
      console.log(`Railwright floor benchmark — ${new Date().toISOString()}`);
      console.log(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), Node ${process.version}; load average (1 min) at the end ${loadavg()[0].toFixed(1)}`);
      console.log(
        `database: ${built.runs} runs, ${built.units} units, ${built.lots.length} lots, ${measurementCount} measurements; built in ${(built.buildMs / 1000).toFixed(1)} s; ` +
          `${(bytes / 1e6).toFixed(1)} MB = ${(bytes / Number(measurementCount)).toFixed(0)} bytes per measurement (whole file)` +
          (tableBytes ? `, measurements table + its indexes ${(tableBytes / Number(measurementCount)).toFixed(0)} bytes per measurement` : ''),
      );
      // issue 11's figure (compact storage, docs/storage-design.md): captures excluded, by dbstat
      const storage = await measurementStorageSize(sql);
      if (storage) console.log(describeStorageSize(storage));
      console.log(`repetitions: ${reps} after 3 warm-ups; warm page cache; times in ms; service = the code the HTTP route calls`);
      console.log(`${'question'.padEnd(44)} ${'svc p50'.padStart(8)} ${'svc p95'.padStart(8)} ${'SQL p50'.padStart(8)} ${'SQL p95'.padStart(8)} ${'ratio'.padStart(6)} | no stats: ${'svc p50'.padStart(8)} ${'SQL p50'.padStart(8)}`);
      for (const [name, a] of withStats) {
        const b = withoutStats.get(name)!;
        // worse: over 1.5x and over 2 ms slower (smaller differences are this machine's noise)
        const worseThan = (x: number, y: number) => x > 1.5 * y && x - y > 2;
        const worse = (a.service ? worseThan(a.service.p50, b.service!.p50) : false) || worseThan(a.sql.p50, b.sql.p50);
        console.log(
          `${name.padEnd(44)} ${ms(a.service?.p50 ?? NaN, 2).padStart(8)} ${ms(a.service?.p95 ?? NaN, 2).padStart(8)} ${ms(a.sql.p50, 2).padStart(8)} ${ms(a.sql.p95, 2).padStart(8)} ` +
            `${(a.service ? `${ms(a.service.p50 / a.sql.p50, 2)}x` : '').padStart(6)} | ${' '.repeat(10)}${ms(b.service?.p50 ?? NaN, 2).padStart(8)} ${ms(b.sql.p50, 2).padStart(8)}${worse ? '  WORSE WITH STATISTICS' : ''}`,
        );
      }
      console.log(`planner statistics refresh (PRAGMA analysis_limit + ANALYZE + optimize): ${ms(refreshMs, 0)} ms`);
      console.log('targets (issue 11): every floor service p95 < 50 ms; ratio service / SQL <= 2x; no question worse with statistics');
    } finally {
      await app.close();
    }
  } finally {
    if (dir) rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(`Floor benchmark failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  process.exit(1);
});
