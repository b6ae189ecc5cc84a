import { MikroORM } from '@mikro-orm/sqlite';
import type { ConfigService } from '@nestjs/config';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildHistory } from '../src/bench/floor-bench-build';
import type { BreakdownDimension } from '../src/contract/yield-views';
import { insertMeasurementsSql, measurementParams } from '../src/runs/measurement-store';
import { QuantityStatsService } from '../src/yield/quantity-stats.service';
import { YieldFiguresService } from '../src/yield/yield-figures.service';

/*
 * Issue 12 (bench:yield): the yield figures read RTY from `run_steps`, a per-(run, step) summary that a trigger
 * writes with the measurements (Migration20261203020000), and rank the units once per request. These checks hold
 * the new reads to the answer of the measurement-based SQL they replaced, on a seeded history (template runs
 * through the real engine, then bulk copies through the product's measurement INSERT) — self-constructed example.
 */

type Row = Record<string, unknown>;

/** The previous release's per-unit ranking (window functions over every judged run of the unit). */
function referencePerUnit(where: string): string {
  return `with ranked as (
  select r.id, r.unit_id, r.verdict, r.started_at, r.lot_id, r.product_id, r.station_id,
    row_number() over (partition by r.unit_id order by r.attempt asc, r.id asc) as first_rank,
    first_value(r.verdict) over (partition by r.unit_id order by r.attempt desc, r.id desc) as last_verdict
  from test_runs r where r.verdict in ('pass', 'fail') and r.product_id = ?
),
per_unit as (select f.id as run_id, f.unit_id, f.verdict as first_verdict, f.last_verdict, f.started_at, f.lot_id, f.station_id from ranked f where f.first_rank = 1${where})`;
}

/** The previous release's RTY: which steps each first judged run entered and failed, read from its measurements. */
function referenceRty(where: string): string {
  return `${referencePerUnit(where)},
steps as (
  select m.run_id, m.step_key, min(m.step_index) as step_index, max(m.step_name) as step_name, max(case when m.verdict <> 'pass' then 1 else 0 end) as failed
  from measurements m join per_unit p on p.run_id = m.run_id group by m.run_id, m.step_key
)
select step_key, min(step_index) as step_index, max(step_name) as step_name, count(*) as entered, sum(case when failed = 0 then 1 else 0 end) as passed
from steps group by step_key order by min(step_index), step_key`;
}

describe('yield figures read lean (run_steps summary, one ranking) and answer as before', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-yield-lean-'));
  let orm: MikroORM;
  let service: YieldFiguresService;
  let productId: number;
  let lots: { id: number; code: string }[];
  const sql = (q: string, p: unknown[] = []) => orm.em.getConnection().execute(q, p) as Promise<Row[]>;

  beforeAll(async () => {
    Object.assign(process.env, { DATABASE_PATH: join(dir, 'lean.sqlite'), JWT_SECRET: 'lean-test-secret-at-least-32-bytes-long', LOG_LEVEL: 'error', FIXTURE_SIM_TIMING: 'instant' });
    const { createOrmConfig } = await import('../src/mikro-orm.config');
    orm = await MikroORM.init(createOrmConfig(join(dir, 'lean.sqlite'), { debug: false }));
    const built = await buildHistory(orm, 1500, () => undefined);
    lots = built.lots;
    stationIds = built.stations.map((s) => s.id);
    productId = Number((await sql('select product_id from lots where id = ?', [lots[0].id]))[0].product_id);
    const config = { get: () => '06:00,14:00,22:00' } as unknown as ConfigService<never, true>;
    service = new YieldFiguresService(orm.em.fork() as never, config as never);
  }, 120_000);

  afterAll(async () => {
    await orm?.close(true);
    rmSync(dir, { recursive: true, force: true });
  });

  it('keeps one run_steps row per run and step with measurements, failed exactly when a measurement of it did not pass', async () => {
    const expected = await sql(
      `select m.run_id, m.step_index, m.step_key, max(m.step_name) as step_name, max(m.verdict <> 'pass') as failed from measurements m group by m.run_id, m.step_index order by 1, 2`,
    );
    const actual = await sql(
      `select s.run_id, s.step_index, l.step_key, l.step_name, s.failed from run_steps s join step_labels l on l.id = s.step_label_id order by 1, 2`,
    );
    expect(expected.length).toBeGreaterThan(1000);
    expect(actual).toEqual(expected);
    expect(actual.some((r) => r.failed === 1)).toBe(true);
  });

  it('writes the summary in the same statement as a step of measurements, a fail once it has one whatever the order', async () => {
    const [run] = await sql(`select id from test_runs where verdict = 'pass' order by id limit 1`);
    const [m] = await sql('select * from measurements where run_id = ? order by id limit 1', [run.id]);
    // a fresh run row (copied), then one step: a passing and a guard-band failing reading in ONE insert
    const [{ id: runId }] = await sql(
      `insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, attempt, verdict, started_at)
       select created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, 9, 'error', started_at from test_runs where id = ? returning id`,
      [run.id],
    );
    const row = (verdict: string, stepIndex: number) =>
      ({ stepIndex, stepKey: `k${stepIndex}`, stepName: `Step ${stepIndex}`, quantity: 'q', name: 'Q', value: 1, unit: 'V', lowLimit: 0, highLimit: 2, guardedLow: null, guardedHigh: null,
        uncertainty: 0, rule: String(m.rule), verdict, decision: null, raw: {}, startedAt: new Date(), measuredAt: new Date() }) as never;
    const rows = [row('pass', 40), row('guard_fail', 40), row('pass', 40), row('pass', 41)];
    await sql(insertMeasurementsSql(rows.length), rows.flatMap((r) => measurementParams(Number(runId), r, Date.now())));
    const steps = await sql(
      'select s.step_index, l.step_key, l.step_name, s.failed from run_steps s join step_labels l on l.id = s.step_label_id where s.run_id = ? order by 1',
      [runId],
    );
    expect(steps).toEqual([
      { step_index: 40, step_key: 'k40', step_name: 'Step 40', failed: 1 },
      { step_index: 41, step_key: 'k41', step_name: 'Step 41', failed: 0 },
    ]);
  });

  const cases: { name: string; q: () => Record<string, unknown>; where: () => [string, unknown[]] }[] = [
    { name: 'one lot', q: () => ({ lotId: lots[1].id }), where: () => [' and f.lot_id = ?', [lots[1].id]] },
    { name: 'the product, whole history', q: () => ({ productId }), where: () => ['', []] },
    {
      name: 'the product, last 120 days',
      q: () => ({ productId, from: new Date(Date.now() - 120 * 86400_000).toISOString() }),
      where: () => [' and f.started_at >= ?', [Date.now() - 120 * 86400_000]],
    },
    {
      // a unit whose first judged run was on another station is not this station's, even if retested here
      name: 'the product at one station',
      q: () => ({ productId, stationId: stationId() }),
      where: () => [' and f.station_id = ?', [stationId()]],
    },
  ];
  const stationId = () => stationIds[1];
  let stationIds: number[] = [];

  for (const c of cases) {
    it(`gives the RTY steps and the first-pass / final counts the measurement-based SQL gave (${c.name})`, async () => {
      const [where, params] = c.where();
      const q = c.q();
      // the date is fixed once for both sides
      if (typeof q.from === 'string') params[params.length - 1] = Date.parse(q.from);
      const view = await service.figures({ ...q, by: 'lot' } as never);
      const ref = await sql(referenceRty(where), [productId, ...params]);
      expect(ref.length).toBeGreaterThan(0);
      expect(view.rty.steps.map((s) => [s.stepKey, s.stepName, s.entered, s.passedFirstTime])).toEqual(
        ref.map((r) => [r.step_key, r.step_name, r.entered, r.passed]),
      );
      const [counts] = await sql(
        `${referencePerUnit(where)} select count(*) as tested, sum(p.first_verdict = 'pass') as first, sum(p.last_verdict = 'pass' and u.state <> 'scrapped') as final
         from per_unit p join units u on u.id = p.unit_id`,
        [productId, ...params],
      );
      expect([view.overall.unitsTested, view.overall.firstPass.x, view.overall.final.x]).toEqual([counts.tested, counts.first, counts.final]);
      expect(view.overall.firstPass.x).toBeLessThan(view.overall.unitsTested);
    });
  }

  it('gives capability the values and the latest of the limit sets the two-statement SQL gave, in one pass', async () => {
    const quantity = new QuantityStatsService(orm.em.fork() as never);
    const [m] = await sql(
      `select m.step_key, m.quantity from measurements m join test_runs r on r.id = m.run_id where r.verdict = 'pass' and m.value is not null and m.low_limit is not null and m.high_limit is not null order by m.id desc limit 1`,
    );
    const ask = { productId, step: String(m.step_key), quantity: String(m.quantity) };
    const from = `from test_runs r join measurements m on m.run_id = r.id where r.verdict in ('pass', 'fail') and m.step_key = ? and m.quantity = ? and m.value is not null and r.product_id = ?`;
    const reference = async () => {
      const p = [ask.step, ask.quantity, productId];
      const values = (await sql(`select m.value ${from} order by r.started_at, r.id, m.id`, p)).map((r) => r.value);
      const sets = await sql(
        `select m.low_limit, m.high_limit, m.guarded_low, m.guarded_high, m.unit, m.name, m.step_name, max(r.started_at) as last_at ${from}
         group by m.low_limit, m.high_limit, m.guarded_low, m.guarded_high order by last_at desc`,
        p,
      );
      return { values, sets };
    };
    const check = async () => {
      const view = await quantity.capability(ask as never);
      const ref = await reference();
      expect(view.n).toBe(ref.values.length);
      expect(view.limitSets).toBe(ref.sets.length);
      expect(view.limits).toEqual({ lowLimit: ref.sets[0].low_limit, highLimit: ref.sets[0].high_limit, guardedLow: ref.sets[0].guarded_low, guardedHigh: ref.sets[0].guarded_high });
      expect([view.name, view.stepName, view.unit]).toEqual([ref.sets[0].name, ref.sets[0].step_name, ref.sets[0].unit]);
      return view;
    };
    const before = await check();
    // a newer judged run measured against a widened limit: a second set, and the latest
    const [last] = await sql(`select r.id from test_runs r join measurements m on m.run_id = r.id where r.verdict in ('pass', 'fail') and m.step_key = ? and m.quantity = ? order by r.started_at desc, r.id desc limit 1`, [ask.step, ask.quantity]);
    const [{ id: runId }] = await sql(
      `insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, attempt, verdict, started_at, finished_at)
       select created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, 8, 'pass', started_at + 1000, finished_at + 1000 from test_runs where id = ? returning id`,
      [last.id],
    );
    await sql(
      `insert into measurements (created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, guarded_low, guarded_high, uncertainty, rule, verdict, raw, started_at, measured_at, decision)
       select created_at, updated_at, ?, step_index, step_key, step_name, quantity, name, value, unit, low_limit - 1, high_limit + 1, guarded_low, guarded_high, uncertainty, rule, verdict, raw, started_at + 1000, measured_at + 1000, decision
       from measurements where run_id = ? and step_key = ? and quantity = ?`,
      [runId, last.id, ask.step, ask.quantity],
    );
    const after = await check();
    expect(after.limitSets).toBe(before.limitSets + 1);
    expect(after.limits.lowLimit).toBeCloseTo((before.limits.lowLimit as number) - 1, 12);
  });

  it('gives every breakdown the same totals and a trend that adds up to them', async () => {
    for (const by of ['lot', 'product', 'station', 'fixture', 'operator', 'day', 'shift'] as BreakdownDimension[]) {
      const view = await service.figures({ productId, by } as never);
      const sum = (gs: typeof view.breakdown) => gs.reduce((a, g) => [a[0] + g.unitsTested, a[1] + g.firstPass.x, a[2] + g.final.x], [0, 0, 0]);
      expect(sum(view.breakdown), by).toEqual([view.overall.unitsTested, view.overall.firstPass.x, view.overall.final.x]);
      expect(sum(view.trend), by).toEqual(sum(view.breakdown));
      expect(view.trend.map((g) => g.key)).toEqual([...view.trend.map((g) => g.key)].sort());
    }
  });
});
