/**
 * Engine benchmark: `npm run bench:engine -w station-api` (after `npm run build`).
 *
 * 1,000 units back to back through the real engine, on a temporary SQLite database, against the in-process
 * simulated fixture with instant timing (zero latency). For every step it records the wall time, and prints
 * the software overhead per step — wall time minus the time the simulator itself needs for that step's
 * commands — as median and p95, plus units per minute.
 *
 * Time inside the simulator: every command line is recorded with the step it belongs to and, after the
 * runs, replayed in the same order into a fresh simulator with the same configuration, timing each step's
 * lines in isolation. (Timing the live simulator would count whatever else the event loop did meanwhile,
 * such as database callbacks, as simulator time.) Options: --units <n> (default 1000); --synchronous normal|full (SQLite's commit durability
 * on the benchmark's database; the server uses the ORM configuration's setting, full by default).
 */
import 'reflect-metadata';
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { FixtureSimulator } from '@railwright/mock-fixture';

interface StepSample {
  kind: string;
  wallMs: number;
  simMs: number;
}

function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  // nearest-rank on the sorted sample (common practice, no source)
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[rank];
}

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

  const orm = await MikroORM.init(createOrmConfig(dbPath));
  try {
    // the pool holds one connection, so this applies to every statement that follows
    if (synchronous) await orm.em.getConnection().execute(`PRAGMA synchronous = ${synchronous}`);
    const mode = (await orm.em.getConnection().execute('PRAGMA synchronous'))[0] as { synchronous: number };
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

    const verdicts = new Map<string, number>();
    const t0 = performance.now();
    for (const serial of serials) {
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
      });
      const outcome = await started.done;
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

    const overhead = samples.map((s) => s.wallMs - s.simMs).sort((a, b) => a - b);
    const wall = samples.map((s) => s.wallMs).sort((a, b) => a - b);
    const sim2 = samples.map((s) => s.simMs).sort((a, b) => a - b);
    const byKind = new Map<string, number[]>();
    for (const s of samples) byKind.set(s.kind, [...(byKind.get(s.kind) ?? []), s.wallMs - s.simMs]);
    const f = (x: number) => x.toFixed(3);
    console.log(`Railwright engine benchmark — ${new Date().toISOString()}`);
    console.log(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), Node ${process.version}`);
    console.log(`SQLite: WAL, synchronous = ${['OFF', 'NORMAL', 'FULL', 'EXTRA'][mode.synchronous] ?? mode.synchronous}`);
    console.log(`units: ${units}, steps: ${samples.length}, fixture lines: ${lines.length}, verdicts: ${JSON.stringify(Object.fromEntries(verdicts))}`);
    console.log(`total: ${(totalMs / 1000).toFixed(2)} s, ${((units / totalMs) * 60_000).toFixed(0)} units/min, ${f(totalMs / units)} ms/unit`);
    console.log(`per step (ms)       median     p95`);
    console.log(`  wall            ${f(quantile(wall, 0.5)).padStart(8)} ${f(quantile(wall, 0.95)).padStart(8)}`);
    console.log(`  in simulator    ${f(quantile(sim2, 0.5)).padStart(8)} ${f(quantile(sim2, 0.95)).padStart(8)}`);
    console.log(`  overhead        ${f(quantile(overhead, 0.5)).padStart(8)} ${f(quantile(overhead, 0.95)).padStart(8)}`);
    console.log(`overhead by step kind (median / p95 ms):`);
    for (const [kind, xs] of byKind) {
      xs.sort((a, b) => a - b);
      console.log(`  ${kind.padEnd(24)} ${f(quantile(xs, 0.5)).padStart(8)} ${f(quantile(xs, 0.95)).padStart(8)}`);
    }
  } finally {
    await orm.close(true);
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(`Benchmark failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  process.exit(1);
});
