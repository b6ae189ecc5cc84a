import type { INestApplicationContext } from '@nestjs/common';
import type { BuiltHistory } from './floor-bench-build';

/**
 * The yield benchmark's questions: each one answered through the service its HTTP route calls and by
 * hand-written SQL on the same connection (the floor: what a person who knows the schema and its indexes
 * would write for the same answer). Not product code.
 */
export interface YieldQuestion {
  name: string;
  service: () => Promise<unknown>;
  sql: () => Promise<unknown>;
  /** the hand-written statements, for `--explain` */
  plans?: [string, unknown[]][];
}

type Sql = (q: string, p?: unknown[]) => Promise<Record<string, unknown>[]>;

/** Per unit in scope: its first judged run and the verdict of its latest judged run (hand-written form). */
function perUnit(scope: string): string {
  return `with scope_units as (select distinct r.unit_id from test_runs r where r.verdict in ('pass', 'fail') and ${scope}),
pu as (
  select s.unit_id,
    (select r.id from test_runs r where r.unit_id = s.unit_id and r.verdict in ('pass', 'fail') order by r.attempt, r.id limit 1) as first_id,
    (select r.verdict from test_runs r where r.unit_id = s.unit_id and r.verdict in ('pass', 'fail') order by r.attempt desc, r.id desc limit 1) as last_verdict
  from scope_units s
),
fr as (select f.*, pu.last_verdict from pu join test_runs f on f.id = pu.first_id)`;
}

export async function yieldQuestions(app: INestApplicationContext, sql: Sql, built: BuiltHistory): Promise<YieldQuestion[]> {
  const { YieldFiguresService } = await import('../yield/yield-figures.service');
  const { FailureParetoService } = await import('../yield/failure-pareto.service');
  const { QuantityStatsService } = await import('../yield/quantity-stats.service');
  const { RunsService } = await import('../runs/runs.service');
  const { RUN_VIEW_SELECT, MEASUREMENT_VIEW_SELECT } = await import('../runs/run-queries');
  const figures = app.get(YieldFiguresService);
  const pareto = app.get(FailureParetoService);
  const quantity = app.get(QuantityStatsService);
  const runs = app.get(RunsService);

  const lot = built.lots[Math.floor(built.lots.length / 2)];
  const [{ product_id: productIdRaw }] = await sql('select product_id from lots where id = ?', [lot.id]);
  const productId = Number(productIdRaw);
  const fromMs = Date.now() - 30 * 86400_000;
  const from = new Date(fromMs).toISOString();
  const [{ id: passRun }] = await sql("select id from test_runs where verdict = 'pass' order by id desc limit 1");
  const [q] = await sql(
    'select step_key, quantity from measurements where run_id = ? and value is not null and low_limit is not null and high_limit is not null order by id limit 1',
    [passRun],
  );
  const step = String(q.step_key);
  const qty = String(q.quantity);
  // a unit tested twice (failed, then retested), in the middle of the history
  const [{ unit_id: retestedUnit }] = await sql('select unit_id from test_runs where lot_id = ? and attempt = 2 order by id limit 1', [lot.id]);

  const figuresSql = (scope: string, scopeParams: unknown[], firstFilter: string, firstParams: unknown[], by: string) => {
    const head = perUnit(scope);
    const group = (key: string) =>
      `${head} select ${key} as grp, count(*) as tested, sum(fr.verdict = 'pass') as first_passed, sum(fr.last_verdict = 'pass' and u.state <> 'scrapped') as final_passed
       from fr join units u on u.id = fr.unit_id where 1 = 1${firstFilter} group by grp`;
    const rty = `${head}, steps as (
        select m.run_id, m.step_key, min(m.step_index) as step_index, max(m.step_name) as step_name, max(m.verdict <> 'pass') as failed
        from fr join measurements m on m.run_id = fr.id where 1 = 1${firstFilter} group by m.run_id, m.step_key)
      select step_key, min(step_index) as step_index, max(step_name) as step_name, count(*) as entered, sum(failed = 0) as passed from steps group by step_key order by 2`;
    const p = [...scopeParams, ...firstParams];
    const statements: [string, unknown[]][] = [
      [group(by), p],
      [group(`date(fr.started_at / 1000, 'unixepoch', 'localtime')`), p],
      [rty, p],
    ];
    return { statements, run: async () => Promise.all(statements.map(([s, ps]) => sql(s, ps))) };
  };

  const lotFigures = figuresSql('r.lot_id = ?', [lot.id], '', [], 'fr.station_id');
  const productFigures = figuresSql('r.product_id = ? and r.started_at >= ?', [productId, fromMs], ' and fr.started_at >= ?', [fromMs], 'fr.lot_id');

  const paretoSql = (byQuantity: boolean, where: string, params: unknown[]) => {
    const statements: [string, unknown[]][] = [
      [
        byQuantity
          ? `select m.step_key, m.quantity, max(m.step_name), max(m.name), count(*) from test_runs r join measurements m on m.run_id = r.id
             where r.verdict = 'fail' and m.verdict in ('fail', 'guard_fail') and ${where} group by m.step_key, m.quantity`
          : `select m.step_key, max(m.step_name), count(distinct m.run_id) from test_runs r join measurements m on m.run_id = r.id
             where r.verdict = 'fail' and m.verdict in ('fail', 'guard_fail') and ${where} group by m.step_key`,
        params,
      ],
      [`select count(*) from test_runs r where r.verdict = 'fail' and ${where}`, params],
    ];
    return { statements, run: async () => Promise.all(statements.map(([s, ps]) => sql(s, ps))) };
  };
  const lotPareto = paretoSql(false, 'r.lot_id = ?', [lot.id]);
  const productPareto = paretoSql(true, 'r.product_id = ? and r.started_at >= ?', [productId, fromMs]);

  const valuesSql = (where: string, params: unknown[]) => {
    const statements: [string, unknown[]][] = [
      [
        `select m.value from test_runs r join measurements m on m.run_id = r.id where r.verdict in ('pass', 'fail') and m.step_key = ? and m.quantity = ? and m.value is not null and ${where} order by r.started_at, r.id, m.id`,
        [step, qty, ...params],
      ],
      [
        `select m.low_limit, m.high_limit, m.guarded_low, m.guarded_high, max(m.unit), max(m.name), max(m.step_name), max(r.started_at) as last_at from test_runs r join measurements m on m.run_id = r.id
         where r.verdict in ('pass', 'fail') and m.step_key = ? and m.quantity = ? and m.value is not null and ${where} group by 1, 2, 3, 4 order by last_at desc`,
        [step, qty, ...params],
      ],
    ];
    return { statements, run: async () => Promise.all(statements.map(([s, ps]) => sql(s, ps))) };
  };
  const lotValues = valuesSql('r.lot_id = ?', [lot.id]);
  const productValues = valuesSql('r.product_id = ? and r.started_at >= ?', [productId, fromMs]);
  const chartStatement: [string, unknown[]] = [
    `select m.value, u.serial, r.id, m.name, m.unit from test_runs r join measurements m on m.run_id = r.id join units u on u.id = r.unit_id
     where r.verdict in ('pass', 'fail') and r.product_id = ? and m.step_key = ? and m.quantity = ? and m.value is not null
     order by r.started_at desc, r.id desc, m.id desc limit 200`,
    [productId, step, qty],
  ];
  const historyStatements: [string, unknown[]][] = [
    [`${RUN_VIEW_SELECT.replace(' from test_runs r ', ', pv.steps as plan_steps from test_runs r ')} where r.unit_id = ? order by r.attempt, r.id`, [retestedUnit]],
    [`${MEASUREMENT_VIEW_SELECT} where run_id in (select id from test_runs where unit_id = ?) order by run_id, step_index, id`, [retestedUnit]],
  ];

  return [
    { name: 'lot yield (one lot of 500, by station, trend, RTY)', service: () => figures.figures({ lotId: lot.id, by: 'station' }), sql: lotFigures.run, plans: lotFigures.statements },
    {
      name: 'product yield, last 30 days, by lot',
      service: () => figures.figures({ productId, from, by: 'lot' }),
      sql: productFigures.run,
      plans: productFigures.statements,
    },
    { name: 'failure Pareto by step, one lot', service: () => pareto.pareto({ lotId: lot.id, by: 'step' }), sql: lotPareto.run, plans: lotPareto.statements },
    {
      name: 'failure Pareto by quantity, product, last 30 days',
      service: () => pareto.pareto({ productId, from, by: 'quantity' }),
      sql: productPareto.run,
      plans: productPareto.statements,
    },
    { name: `capability + histogram of ${qty}, one lot`, service: () => quantity.capability({ lotId: lot.id, step, quantity: qty }), sql: lotValues.run, plans: lotValues.statements },
    {
      name: `capability + histogram of ${qty}, product, 30 days`,
      service: () => quantity.capability({ productId, from, step, quantity: qty }),
      sql: productValues.run,
      plans: productValues.statements,
    },
    {
      name: `control chart of ${qty}, product, last 200 units`,
      service: () => quantity.controlChart({ productId, step, quantity: qty }),
      sql: () => sql(...chartStatement),
      plans: [chartStatement],
    },
    {
      // GET /api/units/:serial/history is built by another package; its data is one unit's runs with their
      // measurements, here read through the run-detail service (GET /api/runs/:id) for each of the unit's runs
      name: 'unit history (run detail of a retested unit\'s 2 runs)',
      service: async () => {
        const ids = await sql('select id from test_runs where unit_id = ? order by attempt, id', [retestedUnit]);
        return Promise.all(ids.map((r) => runs.get(Number(r.id))));
      },
      sql: async () => Promise.all(historyStatements.map(([s, p]) => sql(s, p))),
      plans: historyStatements,
    },
  ];
}
