/**
 * Engine benchmark: `npm run bench:engine -w station-api` (after `npm run build`).
 *
 * N units back to back through the real engine, on a temporary SQLite database (WAL, synchronous as the
 * server runs it: FULL), against the in-process simulated fixture with instant timing (zero latency).
 *
 * What is inside each timed region (every one ends at a durable commit — yes, the write is committed):
 * - judgment → commit + emit: from the moment a step's limits are judged to the moment its measurements are
 *   committed (one multi-row INSERT, one transaction, fsync'd) and their `measurement:judged` events are
 *   handed to the publisher. This is the issue-11 target.
 * - step: from the step's start to the same point: fixture commands, judging, commit and events.
 * - unit: from the start request to the run's verdict stored and `run:finished` sent (run row insert, every
 *   step, safe state, run close with its own commit).
 * - in simulator: the part of a step the simulator itself needs (its command lines replayed alone).
 * - floor: after each unit, in the same process on the same connection (same driver, same settings), every
 *   step's stored rows are written again with the very same INSERT, one durable commit each, nothing else
 *   around it (interleaved with the units, so both see the same machine load). Ratio = engine figure / floor figure.
 * Options: --units <n> (default 1000); --synchronous normal|full (override, for comparison only).
 */
import 'reflect-metadata';
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { FixtureSimulator } from '@railwright/mock-fixture';
import { ms, summarize, summaryRow } from './bench-stats';

interface StepSample {
  kind: string;
  wallMs: number;
  simMs: number;
}


/** The stored columns of a measurement, in the INSERT's order. */
const FLOOR_SELECT =
  'select created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, ' +
  'guarded_low, guarded_high, uncertainty, rule, verdict, decision, raw, started_at, measured_at from measurements';

async function main(): Promise<void> {
  const unitsArg = process.argv.indexOf('--units');
  const units = unitsArg > 0 ? Number(process.argv[unitsArg + 1]) : 1000;
  if (!Number.isInteger(units) || units < 1 || units > 99_999) throw new Error('--units must be a whole number from 1 to 99999');

  const syncArg = process.argv.indexOf('--synchronous');
  const synchronous = syncArg > 0 ? process.argv[syncArg + 1]?.toUpperCase() : undefined;
  if (synchronous !== undefined && !['NORMAL', 'FULL'].includes(synchronous)) throw new Error('--synchronous must be normal or full');

  const dir = mkdtempSync(join(tmpdir(), 'railwright-bench-'));
  const dbPath = join(dir, 'bench.sqlite');
  // set before the config module loads: it reads the environment once
  Object.assign(process.env, { DATABASE_PATH: dbPath, SEED_HISTORY: '0', FIXTURE_SIM_TIMING: 'instant', LOG_LEVEL: 'error' });
  const { MikroORM } = await import('@mikro-orm/sqlite');
  const { createOrmConfig } = await import('../mikro-orm.config');
  const { DemoPlantSeeder } = await import('../database/seeders/DemoPlantSeeder');
  const { PlanSeeder } = await import('../database/seeders/PlanSeeder');
  const { registerLot } = await import('../lots/lot-registration');
  const { Station } = await import('../stations/station.entity');
  const { User } = await import('../users/user.entity');
  const { createSimulatedEngine } = await import('../simulation/simulated-engine');
  const { insertMeasurementsSql } = await import('../runs/measurement-store');

  const orm = await MikroORM.init(createOrmConfig(dbPath));
  try {
    // the pool holds one connection, so this applies to every statement that follows
    if (synchronous) await orm.em.getConnection().execute(`PRAGMA synchronous = ${synchronous}`);
    const mode = (await orm.em.getConnection().execute('PRAGMA synchronous'))[0] as { synchronous: number };
    const journal = (await orm.em.getConnection().execute('PRAGMA journal_mode'))[0] as { journal_mode: string };
    await orm.getMigrator().up();
    await orm.getSeeder().seed(DemoPlantSeeder, PlanSeeder);
    const em = orm.em.fork();
    const station = await em.findOneOrFail(Station, { code: 'EOL-1' }, { populate: ['fixture', 'activeLot.product'] });
    const product = station.activeLot!.product;
    const { lot, serials } = await registerLot(em, { code: 'LB-BENCH-01', product, plannedQuantity: units, at: new Date() });
    await em.flush();
    station.activeLot = lot;
    await em.flush();
    const operator = await em.findOneOrFail(User, { username: 'operator' });

    const { engine, links, events, close, simulation } = createSimulatedEngine(orm.em.fork());
    links.linkFor(station.fixture!);
    const simConfig = { defectRates: {} };
    const handle = await simulation.reconfigure(station.fixture!.code, simConfig);
    const kinds = new Map<string, string>();
    const samples: StepSample[] = [];
    // every line the fixture received, tagged with the step sample it belongs to (-1: between steps)
    const lines: { line: string; sample: number }[] = [];
    let currentSample = -1;
    const live = handle.simulator;
    const handleLine = live.handleLine.bind(live);
    live.handleLine = (line: string) => {
      lines.push({ line, sample: currentSample });
      return handleLine(line);
    };
    events.subscribe((name, payload) => {
      if (name === 'run:started') for (const s of (payload as { steps: { key: string; kind: string }[] }).steps) kinds.set(s.key, s.kind);
    });

    const judgedToStored: number[] = [];
    const floorMs: number[] = [];
    const oneRowMs: number[] = [];
    let engineRows = 0;
    const conn = orm.em.getConnection();
    const lastId = async () => Number(((await conn.execute('select max(id) as id from measurements')) as { id: number }[])[0].id ?? 0);
    const unitMs: number[] = [];
    const verdicts = new Map<string, number>();
    const t0 = performance.now();
    for (const serial of serials) {
      const u0 = performance.now();
      const started = await engine.start({
        stationId: station.id,
        serial,
        requester: { id: operator.id, roles: operator.roles },
        safetyConfirmed: true,
        audit: false,
        onStepStarted: () => (currentSample = samples.length),
        onStepTimed: (t) => {
          samples.push({ kind: kinds.get(t.stepKey) ?? t.stepKey, wallMs: t.wallMs, simMs: 0 });
          currentSample = -1;
        },
        onStepStored: (t) => {
          judgedToStored.push(t.judgedToStoredMs);
          engineRows += t.measurements;
        },
      });
      const outcome = await started.done;
      unitMs.push(performance.now() - u0);
      // the floor, interleaved so both see the same machine load: the same rows, the same statement, the same
      // connection, one durable commit per step and nothing else around it
      const rows = (await conn.execute(`${FLOOR_SELECT} where run_id = ? and id <= ? order by id`, [outcome.runId, await lastId()])) as Record<string, unknown>[];
      const groups = new Map<number, unknown[][]>();
      for (const r of rows) groups.set(Number(r.step_index), [...(groups.get(Number(r.step_index)) ?? []), Object.values(r)]);
      for (const group of groups.values()) {
        const f0 = performance.now();
        await conn.execute(insertMeasurementsSql(group.length), group.flat(), 'all');
        floorMs.push(performance.now() - f0);
        // and one single-row durable commit, for scale
        const f1 = performance.now();
        await conn.execute(insertMeasurementsSql(1), group[0], 'all');
        oneRowMs.push(performance.now() - f1);
      }
      verdicts.set(outcome.verdict, (verdicts.get(outcome.verdict) ?? 0) + 1);
    }
    const totalMs = performance.now() - t0;
    await close();

    // replay into a fresh simulator, alone, to learn what the simulator itself costs per step
    const replay = new FixtureSimulator({ fixtureId: handle.fixtureId, timing: 'instant', config: simConfig });
    for (const { line, sample } of lines) {
      const r0 = performance.now();
      await replay.handleLine(line);
      if (sample >= 0) samples[sample].simMs += performance.now() - r0;
    }


    const judged = summarize(judgedToStored);
    const floor = summarize(floorMs);
    const byKind = new Map<string, number[]>();
    for (const s of samples) byKind.set(s.kind, [...(byKind.get(s.kind) ?? []), s.wallMs]);
    const head = `  ${''.padEnd(34)} ${'median'.padStart(9)} ${'mean'.padStart(9)} ${'p95'.padStart(9)} ${'p99'.padStart(9)}`;
    console.log(`Railwright engine benchmark — ${new Date().toISOString()}`);
    console.log(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), Node ${process.version}`);
    console.log(`SQLite: journal_mode = ${journal.journal_mode}, synchronous = ${['OFF', 'NORMAL', 'FULL', 'EXTRA'][mode.synchronous] ?? mode.synchronous}`);
    console.log(`units: ${units}, steps: ${samples.length}, measurements: ${engineRows}, fixture lines: ${lines.length}, verdicts: ${JSON.stringify(Object.fromEntries(verdicts))}`);
    console.log(`total: ${(totalMs / 1000).toFixed(2)} s, ${((units / totalMs) * 60_000).toFixed(0)} units/min`);
    console.log('Every timed region below ends at a durable commit (the write is committed, synchronous as shown).');
    console.log(`times in ms`);
    console.log(head);
    console.log(summaryRow('judgment -> commit + emit, per step', judged));
    console.log(summaryRow('floor: same rows, bare commit', floor));
    console.log(summaryRow('floor: one row, bare commit', summarize(oneRowMs)));
    console.log(summaryRow('step (fixture + judge + commit)', summarize(samples.map((x) => x.wallMs))));
    console.log(summaryRow('  of which in simulator', summarize(samples.map((x) => x.simMs))));
    console.log(summaryRow('unit (start -> verdict stored)', summarize(unitMs)));
    console.log(`ratio judgment->commit+emit / floor: median ${ms(judged.median / floor.median, 2)}x (target <= 3x), ` +
      `p99 ${ms(judged.p99 / floor.p99, 2)}x; p99 ${ms(judged.p99, 2)} ms (target <= 10 ms)`);
    const floorTotal = floorMs.reduce((a, b) => a + b, 0);
    console.log(`whole run / bare commits of the same transactions: ${ms(totalMs / floorTotal, 2)}x (${ms(totalMs / 1000, 2)} s vs ${ms(floorTotal / 1000, 2)} s)`);
    console.log(`step wall by step kind:`);
    console.log(head);
    for (const [kind, xs] of byKind) console.log(summaryRow(kind, summarize(xs)));
  } finally {
    await orm.close(true);
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(`Benchmark failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  process.exit(1);
});
