/**
 * What-if benchmark: `npm run bench:what-if -w station-api` (after `npm run build`).
 *
 * Stores 100,000 measurements (one first run per unit, one measurement per limit of the EOL-BK0503 plan; values
 * spread a little beyond the limits so some units fail), inserted in bulk, then re-judges all of them against a
 * draft with a tightened limit through WhatIfService.forVersion — the call the what-if route makes — and prints
 * median, mean and p95 of that call over the timed repetitions. Options: --measurements <n> (default 100000),
 * --repeat <n> (default 20, after one untimed warm-up call).
 */
import 'reflect-metadata';
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';

function quantile(sorted: number[], q: number): number {
  // nearest-rank on the sorted sample (common practice, no source)
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[rank];
}

/** A small deterministic generator (mulberry32, common practice, no source) so every run stores the same data. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(name);
  const v = i > 0 ? Number(process.argv[i + 1]) : fallback;
  if (!Number.isInteger(v) || v < 1) throw new Error(`${name} must be a whole number above 0`);
  return v;
}

async function main(): Promise<void> {
  const total = arg('--measurements', 100_000);
  const repeat = arg('--repeat', 20);
  const dir = mkdtempSync(join(tmpdir(), 'railwright-bench-'));
  const dbPath = join(dir, 'bench.sqlite');
  Object.assign(process.env, { DATABASE_PATH: dbPath, SEED_HISTORY: '0', FIXTURE_SIM_TIMING: 'instant', LOG_LEVEL: 'error' });
  const { MikroORM } = await import('@mikro-orm/sqlite');
  const { createOrmConfig } = await import('../mikro-orm.config');
  const { DemoPlantSeeder } = await import('../database/seeders/DemoPlantSeeder');
  const { PlanSeeder } = await import('../database/seeders/PlanSeeder');
  const { AuditService } = await import('../audit/audit.service');
  const { PlansService } = await import('../plans/plans.service');
  const { PlanVersion, PlanVersionState } = await import('../plans/plan-version.entity');
  const { stepsChecksum } = await import('../plans/plan-file');
  const { judge } = await import('../measure/acceptance');
  const { WhatIfService } = await import('../what-if/what-if.service');
  const { demoHistoryContext, insertHistory } = await import('../what-if/stored-history');

  const orm = await MikroORM.init(createOrmConfig(dbPath));
  try {
    await orm.getMigrator().up();
    await orm.getSeeder().seed(DemoPlantSeeder, PlanSeeder);
    const em = orm.em.fork();
    const ctx = await demoHistoryContext(em, 'OB-BK0503');
    const released = await em.findOneOrFail(PlanVersion, ctx.planVersionId);
    const limits = released.steps.flatMap((s, stepIndex) => s.limits.map((l) => ({ s, stepIndex, l })));
    const units = Math.ceil(total / limits.length);
    const random = rng(20261202);
    const t0 = Date.UTC(2026, 10, 1);
    const runs = [];
    let stored = 0;
    for (let u = 0; u < units; u++) {
      const measurements = [];
      for (const { s, stepIndex, l } of limits) {
        if (stored >= total) break;
        stored++;
        let value: number;
        if (l.low !== undefined && l.high !== undefined) {
          const w = l.high - l.low;
          value = l.low === l.high ? l.low : l.low - 0.05 * w + random() * 1.1 * w;
        } else if (l.high !== undefined) value = random() * 1.03 * l.high;
        else value = l.low! * (0.995 + random() * 0.04);
        const verdict = judge(value, { low: l.low, high: l.high, uncertainty: l.uncertainty ?? 0, rule: l.rule }).verdict;
        measurements.push({ stepIndex, stepKey: s.key, quantity: l.key, unit: l.unit, value, low: l.low, high: l.high, uncertainty: l.uncertainty ?? 0, rule: l.rule, verdict });
      }
      const verdict = measurements.every((m) => m.verdict === 'pass') ? ('pass' as const) : ('fail' as const);
      runs.push({ serial: `K5A-2645-${String(u).padStart(5, '0')}`, verdict, startedAt: new Date(t0 + u * 30_000), measurements });
    }
    const insertStart = performance.now();
    await insertHistory(em, ctx, runs);
    const insertMs = performance.now() - insertStart;

    const steps = structuredClone(released.steps);
    const vout = steps.find((s) => s.key === 'vout-load')!.limits[0];
    vout.high = (vout.high ?? 5.1) - 0.03;
    const draft = em.create(
      PlanVersion,
      { plan: released.plan, version: 99, state: PlanVersionState.Draft, reason: 'benchmark draft', stopAtFirstFailure: false, maxAttempts: 3, steps, checksum: stepsChecksum(steps) },
      { partial: true },
    );
    await em.flush();

    const times: number[] = [];
    let last;
    for (let i = 0; i <= repeat; i++) {
      const callEm = orm.em.fork();
      const service = new WhatIfService(callEm, new PlansService(callEm, new AuditService(callEm)));
      const start = performance.now();
      last = await service.forVersion(draft.id, { scope: 'last_units', units: 100_000 });
      const ms = performance.now() - start;
      if (i > 0) times.push(ms);
    }
    times.sort((a, b) => a - b);
    const mean = times.reduce((a, b) => a + b, 0) / times.length;
    // where the call's time goes: the same three phases forVersion runs, timed one by one
    const { rejudge } = await import('../what-if/rejudge');
    const phases = { scope: [] as number[], read: [] as number[], rejudge: [] as number[] };
    for (let i = 0; i < Math.min(repeat, 10); i++) {
      const callEm = orm.em.fork();
      const service = new WhatIfService(callEm, new PlansService(callEm, new AuditService(callEm)));
      let t = performance.now();
      const { runs: scoped } = await service.unitRuns(ctx.productId, { scope: 'last_units', units: 100_000 });
      phases.scope.push(performance.now() - t);
      t = performance.now();
      const ms = await service.measurementsOf(scoped.map((r) => r.runId));
      phases.read.push(performance.now() - t);
      t = performance.now();
      rejudge(draft.steps, scoped, ms);
      phases.rejudge.push(performance.now() - t);
    }
    const med = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.ceil(xs.length / 2) - 1];
    console.log(`What-if benchmark on ${cpus().length} × ${cpus()[0]?.model ?? 'CPU'}, Node ${process.version}`);
    console.log(`stored ${stored} measurements of ${units} units in ${(insertMs / 1000).toFixed(1)} s (bulk insert)`);
    console.log(`re-judged ${last!.measurementsJudged} measurements, ${last!.unitsInScope} units: pass→fail ${last!.passToFail}, fail→pass ${last!.failToPass}`);
    console.log(`call time over ${repeat} calls: median ${quantile(times, 0.5).toFixed(0)} ms, mean ${mean.toFixed(0)} ms, p95 ${quantile(times, 0.95).toFixed(0)} ms, max ${times[times.length - 1].toFixed(0)} ms`);
    console.log(`phases (median of ${phases.scope.length}): scope query ${med(phases.scope).toFixed(0)} ms, reading the measurements ${med(phases.read).toFixed(0)} ms, re-judging ${med(phases.rejudge).toFixed(0)} ms`);
    console.log(`load average (1 min) at the end: ${loadavg()[0].toFixed(1)}`);
  } finally {
    await orm.close(true);
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
