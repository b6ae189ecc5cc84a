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
 * Every sort the runs list offers gets its own line (issue 11: sorting the whole history cost 400-1,000 ms).
 * Load average is printed at the start and the end of timing: on a shared machine, judge by the ratios.
 * Options: --runs <n> (default 100000), --reps <n> (default 100: enough samples that p95 is not the
 * largest one or two), --db <file> (time a copy of a file kept by `bench:yield --keep` instead of building
 * one; the same builder made it; the start-up migrates it), --only <text> (time only the questions whose name
 * holds the text, to check one change; a full run is what docs/performance.md records).
 */
import 'reflect-metadata';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { describeStorageSize, measurementStorageSize } from '../runs/measurement-storage-size';
import { ms, quantile } from './bench-stats';

/** The text after an option, or undefined when it is not given. */
function textArg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
}

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(name);
  const v = i > 0 ? Number(process.argv[i + 1]) : fallback;
  if (!Number.isInteger(v) || v < 1) throw new Error(`${name} must be a whole number of 1 or more`);
  return v;
}

interface Times {
  n: number;
  p50: number;
  p95: number;
  mean: number;
  max: number;
}

/** Each figure stops after `reps` samples or, for a slow one, after BUDGET_MS with at least MIN_SAMPLES. */
const BUDGET_MS = 15_000;
const MIN_SAMPLES = 10;

async function timeIt(reps: number, fn: (i: number) => Promise<unknown>): Promise<Times> {
  for (let i = 0; i < 3; i++) await fn(i);
  const xs: number[] = [];
  const start = performance.now();
  for (let i = 0; i < reps && (i < MIN_SAMPLES || performance.now() - start < BUDGET_MS); i++) {
    const t0 = performance.now();
    await fn(i);
    xs.push(performance.now() - t0);
  }
  xs.sort((a, b) => a - b);
  return { p50: quantile(xs, 0.5), p95: quantile(xs, 0.95), mean: xs.reduce((a, b) => a + b, 0) / xs.length, max: xs[xs.length - 1], n: xs.length };
}

async function main(): Promise<void> {
  const runTarget = arg('--runs', 100_000);
  const reps = arg('--reps', 100);
  const reuse = textArg('--db');
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
    const { floorQuestions } = await import('./floor-bench-questions');
    const { DatabaseMaintenanceService } = await import('../database/maintenance/database-maintenance.service');
    const app = await NestFactory.createApplicationContext(AppModule, { logger: ['error'] });
    try {
      const { MikroORM: CoreOrm } = await import('@mikro-orm/core');
      const conn = app.get(CoreOrm).em.getConnection();
      const sql = (q: string, p: unknown[] = []) => conn.execute(q, p) as Promise<Record<string, unknown>[]>;
      const only = textArg('--only');
      const questions = (await floorQuestions(app, sql, built)).filter((qn) => !only || qn.name.includes(only));
      if (only) log(`only the questions whose name holds "${only}": ${questions.length}`);

      // each question is timed without planner statistics, then with them (the server's own refresh), in
      // turn, so both see the same machine load and the same page cache
      const maintenance = app.get(DatabaseMaintenanceService);
      const statsOff = async () => {
        await sql('delete from sqlite_stat1');
        // a schema change makes the connection reload its (now empty) statistics
        await sql('create table bench_reload (x integer)');
        await sql('drop table bench_reload');
      };
      type Pair = { service?: Times; sql: Times };
      const withStats = new Map<string, Pair>();
      const withoutStats = new Map<string, Pair>();
      const load0 = loadavg();
      const t0 = performance.now();
      for (const qn of questions) {
        await statsOff();
        withoutStats.set(qn.name, { service: qn.service ? await timeIt(reps, qn.service) : undefined, sql: await timeIt(reps, qn.sql) });
        await maintenance.refresh('bench');
        withStats.set(qn.name, { service: qn.service ? await timeIt(reps, qn.service) : undefined, sql: await timeIt(reps, qn.sql) });
      }
      const timedS = (performance.now() - t0) / 1000;
      const load1 = loadavg();
      const r0 = performance.now();
      await maintenance.refresh('bench');
      const refreshMs = performance.now() - r0;

      const [{ n: measurementCount }] = await sql('select count(*) as n from measurements');
      const perM = (b: number) => (b / Number(measurementCount)).toFixed(0);
      const [{ pages, free, size }] = await sql('select page_count as pages, freelist_count as free, page_size as size from pragma_page_count, pragma_freelist_count, pragma_page_size');
      const used = (Number(pages) - Number(free)) * Number(size);
      let tables = '';
      try {
        const parts = await sql(
          "select m.tbl_name as t, sum(case when d.name = m.tbl_name then d.pgsize else 0 end) as rows, sum(case when d.name <> m.tbl_name then d.pgsize else 0 end) as idx " +
            "from dbstat d join sqlite_master m on m.name = d.name where m.tbl_name in ('measurement_values', 'measurement_defs', 'step_captures', 'test_runs', 'units') group by m.tbl_name order by m.tbl_name",
        );
        tables = parts.map((t) => `${String(t.t)} ${perM(Number(t.rows))} + indexes ${perM(Number(t.idx))}`).join('; ');
      } catch {
        tables = 'dbstat not available';
      }
      const lines: string[] = [];
      const log2 = (x: string) => lines.push(x);
      log2(`Railwright floor benchmark — ${new Date().toISOString()}`);
      log2(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), Node ${process.version}; load average (1 min) ${load0[0].toFixed(1)} at the start of timing, ${load1[0].toFixed(1)} at the end (${timedS.toFixed(0)} s of timing)`);
      log2(
        `database: ${built.runs} runs, ${built.units} units, ${built.lots.length} lots, ${measurementCount} measurements; ` +
          `${reuse ? `reused file ${reuse}` : `built in ${(built.buildMs / 1000).toFixed(1)} s`}; ` +
          `file before start-up ${(bytes / 1e6).toFixed(1)} MB = ${perM(bytes)} bytes per measurement; after its migrations, pages in use ${(used / 1e6).toFixed(1)} MB = ${perM(used)} bytes per measurement`,
      );
      log2(`bytes per measurement by table: ${tables}`);
      // issue 11's figure (compact storage, docs/storage-design.md): captures excluded, by dbstat
      const storage = await measurementStorageSize(sql);
      if (storage) log2(describeStorageSize(storage));
      log2(`repetitions: ${reps} after 3 warm-ups for each figure (fewer, at least ${MIN_SAMPLES}, where a figure would take over ${BUDGET_MS / 1000} s: see samples); warm page cache; times in ms; svc = the service the HTTP route calls (one complete answer: SQL run, rows read, objects built); SQL = hand-written SQL, same question`);
      const h = (x: string, w = 8) => x.padStart(w);
      log2(
        `${'question'.padEnd(44)} ${h('svc p50')} ${h('svc p95')} ${h('svc mean')} ${h('svc max')} | ${h('SQL p50')} ${h('SQL p95')} | ${h('ratio', 7)} ${h('p95', 7)} | no stats: ${h('svc p50')} ${h('SQL p50')} | samples svc/SQL`,
      );
      for (const [name, a] of withStats) {
        const b = withoutStats.get(name)!;
        // worse: over 1.5x and over 2 ms slower (smaller differences are this machine's noise)
        const worseThan = (x: number, y: number) => x > 1.5 * y && x - y > 2;
        const flags = [
          (a.service ? worseThan(a.service.p50, b.service!.p50) : false) || worseThan(a.sql.p50, b.sql.p50) ? 'WORSE WITH STATISTICS' : '',
          a.service && a.service.p95 > 50 ? 'p95 over 50 ms' : '',
          a.service && a.service.p50 / a.sql.p50 > 2 ? 'ratio over 2x' : '',
        ].filter(Boolean);
        const f = (t: Times | undefined, k: keyof Times) => h(ms(t ? t[k] : NaN, 2));
        log2(
          `${name.padEnd(44)} ${f(a.service, 'p50')} ${f(a.service, 'p95')} ${f(a.service, 'mean')} ${f(a.service, 'max')} | ${f(a.sql, 'p50')} ${f(a.sql, 'p95')} | ` +
            `${h(a.service ? `${ms(a.service.p50 / a.sql.p50, 2)}x` : '', 7)} ${h(a.service ? `${ms(a.service.p95 / a.sql.p95, 2)}x` : '', 7)} | ${' '.repeat(10)}${f(b.service, 'p50')} ${f(b.sql, 'p50')} | ${a.service?.n ?? '-'}/${a.sql.n}` +
            (flags.length ? `  ${flags.join(', ')}` : ''),
        );
      }
      log2(`planner statistics refresh (PRAGMA analysis_limit + ANALYZE + optimize): ${ms(refreshMs, 0)} ms`);
      log2('targets (issue 11): every floor service p95 < 50 ms; ratio service / SQL <= 2x; no question worse with statistics');
      console.log(lines.join('\n'));
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
