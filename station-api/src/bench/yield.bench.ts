/**
 * Yield benchmark: `npm run bench:yield -w station-api` (after `npm run build`). A script, not a timed test.
 *
 * Builds a year of one line's history on a temporary SQLite file with the floor benchmark's builder (default
 * 100,000 runs, ~1.4 million measurements: template runs through the real engine, then bulk copies through
 * the product's measurement INSERT), starts the real Nest application on it (its start-up refreshes the
 * planner statistics), then times each yield question through the service its HTTP route calls and the same
 * question answered with hand-written SQL on the same file and connection. Prints p50, p95, mean and max of
 * each and the ratio service / SQL (p50 and p95), and the unfiltered runs COUNT with and without planner
 * statistics (issue 11: statistics must not make it worse).
 * A timed region is one complete answer: SQL run, rows read, statistics computed, objects built. Nothing is
 * cached between repetitions except SQLite's page cache (warm cache, as on a running server).
 * Options: --runs <n> (default 100000), --reps <n> (default 30), --explain (print each SQL's query plan),
 * --keep (keep the built file and print its path), --db <file> (time a file kept before instead of building).
 */
import 'reflect-metadata';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { describeStorageSize, measurementStorageSize } from '../runs/measurement-storage-size';
import { ms, quantile } from './bench-stats';
import { describeHistory, type BuiltHistory } from './floor-bench-build';
import { yieldQuestions } from './yield-questions';

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(name);
  const v = i > 0 ? Number(process.argv[i + 1]) : fallback;
  if (!Number.isInteger(v) || v < 1) throw new Error(`${name} must be a whole number of 1 or more`);
  return v;
}

interface Times {
  p50: number;
  p95: number;
  mean: number;
  max: number;
}

function summary(xs: number[]): Times {
  xs.sort((a, b) => a - b);
  return { p50: quantile(xs, 0.5), p95: quantile(xs, 0.95), mean: xs.reduce((a, b) => a + b, 0) / xs.length, max: xs[xs.length - 1] };
}

async function timeIt(reps: number, fn: () => Promise<unknown>): Promise<Times> {
  for (let i = 0; i < 3; i++) await fn();
  const xs: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    await fn();
    xs.push(performance.now() - t0);
  }
  return summary(xs);
}

/**
 * The service and its hand-written SQL timed interleaved (svc, SQL, SQL, svc, ...): on a shared machine both
 * then see the same neighbours, so their ratio compares like with like even when the absolute times do not.
 */
async function timePair(reps: number, svc: () => Promise<unknown>, sql: () => Promise<unknown>): Promise<{ svc: Times; sql: Times }> {
  for (let i = 0; i < 3; i++) {
    await svc();
    await sql();
  }
  const a: number[] = [];
  const b: number[] = [];
  const once = async (fn: () => Promise<unknown>, into: number[]) => {
    const t0 = performance.now();
    await fn();
    into.push(performance.now() - t0);
  };
  for (let i = 0; i < reps; i++) {
    if (i % 2 === 0) {
      await once(svc, a);
      await once(sql, b);
    } else {
      await once(sql, b);
      await once(svc, a);
    }
  }
  return { svc: summary(a), sql: summary(b) };
}

async function main(): Promise<void> {
  const runTarget = arg('--runs', 100_000);
  const reps = arg('--reps', 30);
  const explain = process.argv.includes('--explain');
  const keep = process.argv.includes('--keep');
  const reuse = process.argv.indexOf('--db') > 0 ? process.argv[process.argv.indexOf('--db') + 1] : undefined;
  const dir = reuse ? undefined : mkdtempSync(join(tmpdir(), 'railwright-yield-'));
  const dbPath = reuse ?? join(dir!, 'yield.sqlite');
  Object.assign(process.env, {
    DATABASE_PATH: dbPath,
    SEED_HISTORY: '0',
    FIXTURE_SIM_TIMING: 'instant',
    LOG_LEVEL: 'error',
    UI_DIST: '',
    JWT_SECRET: process.env.JWT_SECRET ?? 'yield-bench-secret-0123456789-0123456789',
  });
  const log = (s: string) => console.log(s);
  try {
    const { MikroORM } = await import('@mikro-orm/sqlite');
    const { createOrmConfig } = await import('../mikro-orm.config');
    const { buildHistory } = await import('./floor-bench-build');
    let built: BuiltHistory;
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
    const app = await NestFactory.createApplicationContext(AppModule, { logger: ['error'] });
    try {
      const { MikroORM: CoreOrm } = await import('@mikro-orm/core');
      const conn = app.get(CoreOrm).em.getConnection();
      const sql = (q: string, p: unknown[] = []) => conn.execute(q, p) as Promise<Record<string, unknown>[]>;
      const questions = await yieldQuestions(app, sql, built);
      const load0 = loadavg();

      const results: { name: string; reps: number; svc: Times; sql: Times }[] = [];
      for (const qn of questions) {
        // short answers get more repetitions: their tails are scheduler noise, and a ratio of two sub-millisecond
        // times needs many samples to mean anything (issue 12 review)
        let once = Infinity;
        for (let i = 0; i < 3; i++) {
          const probe = performance.now();
          await qn.service();
          once = Math.min(once, performance.now() - probe);
        }
        const n = once < 2 ? reps * 10 : once < 20 ? reps * 3 : reps;
        results.push({ name: qn.name, reps: n, ...(await timePair(n, qn.service, qn.sql)) });
        if (explain) for (const [q, p] of qn.plans ?? []) console.log(`${qn.name}:\n${(await sql(`explain query plan ${q}`, p)).map((r) => `  ${String(r.detail)}`).join('\n')}`);
      }

      // the unfiltered runs COUNT without and with planner statistics (issue 11: ANALYZE made it 6x slower once)
      const { DatabaseMaintenanceService } = await import('../database/maintenance/database-maintenance.service');
      const maintenance = app.get(DatabaseMaintenanceService);
      const count = () => sql('select count(*) as total from test_runs r');
      await sql('delete from sqlite_stat1');
      await sql('create table bench_reload (x integer)');
      await sql('drop table bench_reload');
      const countNoStats = await timeIt(reps, count);
      const planNoStats = (await sql('explain query plan select count(*) as total from test_runs r')).map((r) => String(r.detail)).join('; ');
      await maintenance.refresh('bench');
      const countStats = await timeIt(reps, count);
      const planStats = (await sql('explain query plan select count(*) as total from test_runs r')).map((r) => String(r.detail)).join('; ');
      const load1 = loadavg();

      const [{ n: measurementCount }] = await sql('select count(*) as n from measurements');
      console.log(`Railwright yield benchmark — ${new Date().toISOString()}`);
      console.log(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), Node ${process.version}; load average (1 min) ${load0[0].toFixed(1)} at the start of timing, ${load1[0].toFixed(1)} at the end`);
      console.log(
        `database: ${built.runs} runs, ${built.units} units, ${built.lots.length} lots, ${measurementCount} measurements; ${Number.isFinite(built.buildMs) ? `built in ${(built.buildMs / 1000).toFixed(1)} s` : `reused ${dbPath}`}; ` +
          `${(bytes / 1e6).toFixed(1)} MB = ${(bytes / Number(measurementCount)).toFixed(0)} bytes per measurement (whole file)`,
      );
      // issue 11's figure (compact storage, docs/storage-design.md): captures excluded, by dbstat
      const storage = await measurementStorageSize(sql);
      if (storage) console.log(describeStorageSize(storage));
      // what the RTY summary (Migration20261203020000) costs on this file: its pages, per stored measurement
      const summary = await sql(
        `select coalesce(sum(pgsize), 0) as bytes from dbstat where name in ('run_steps', 'step_labels', 'step_labels_step_key_step_name_unique')`,
      ).catch(() => [] as Record<string, unknown>[]);
      const summaryBytes = Number(summary[0]?.bytes ?? Number.NaN);
      console.log(`RTY summary run_steps + step_labels: ${(summaryBytes / 1e6).toFixed(1)} MB = ${(summaryBytes / Number(measurementCount)).toFixed(1)} bytes per measurement (dbstat)`);
      console.log(
        `repetitions: ${reps} after 3 warm-ups, service and SQL interleaved (x3 for answers under 20 ms, x10 under 2 ms: column reps); warm page cache; times in ms; ` +
          'svc = the service the HTTP route calls; SQL = hand-written SQL, same answer; ratio = svc / SQL',
      );
      const h = (s: string) => s.padStart(8);
      console.log(`${'question'.padEnd(52)} ${'reps'.padStart(5)} ${h('svc p50')} ${h('svc p95')} ${h('svc mean')} ${h('svc max')} | ${h('SQL p50')} ${h('SQL p95')} ${h('SQL mean')} ${h('SQL max')} | ratio p50  p95`);
      for (const r of results) {
        const row = (t: Times) => [t.p50, t.p95, t.mean, t.max].map((x) => ms(x, 2).padStart(8)).join(' ');
        const flag = r.svc.p95 >= 150 ? '  p95 over 150 ms' : '';
        const ratioFlag = r.svc.p50 / r.sql.p50 > 1.5 ? '  ratio over 1.5x' : '';
        console.log(`${r.name.padEnd(52)} ${String(r.reps).padStart(5)} ${row(r.svc)} | ${row(r.sql)} | ${ms(r.svc.p50 / r.sql.p50, 2).padStart(5)}x ${ms(r.svc.p95 / r.sql.p95, 2).padStart(5)}x${flag}${ratioFlag}`);
      }
      console.log(`COUNT of all runs: without statistics p50 ${ms(countNoStats.p50, 2)} ms, p95 ${ms(countNoStats.p95, 2)} (${planNoStats}); with statistics p50 ${ms(countStats.p50, 2)} ms, p95 ${ms(countStats.p95, 2)} (${planStats})`);
      console.log('targets (issue 12): every yield endpoint p95 < 150 ms; ratio service / hand-written SQL <= 1.5x');
    } finally {
      await app.close();
    }
  } finally {
    if (dir && !keep) rmSync(dir, { recursive: true, force: true });
    else if (dir) console.log(`kept ${dbPath} (delete it when done; --db ${dbPath} times it again)`);
  }
}

main().catch((err: unknown) => {
  console.error(`Yield benchmark failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  process.exit(1);
});
