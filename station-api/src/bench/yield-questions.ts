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

/**
 * Per unit in scope: its first judged run (no judged run of the unit before it in attempt, id order) with the
 * verdict of its latest judged run (hand-written form; a unit's runs share its lot and product, so the probes
 * need only the unit).
 */
function perUnit(scope: string, firstFilter = ''): string {
  return `with fr as materialized (
  select f.id, f.unit_id, f.verdict, f.started_at, f.lot_id, f.station_id, (select l.verdict from test_runs l where l.unit_id = f.unit_id and l.verdict in ('pass', 'fail') order by l.attempt desc, l.id desc limit 1) as last_verdict
  from test_runs f where f.verdict in ('pass', 'fail') and ${scope}${firstFilter}
    and not exists (select 1 from test_runs e where e.unit_id = f.unit_id and e.verdict in ('pass', 'fail') and (e.attempt < f.attempt or (e.attempt = f.attempt and e.id < f.id)))
)`;
}

export async function yieldQuestions(app: INestApplicationContext, sql: Sql, built: BuiltHistory): Promise<YieldQuestion[]> {
  const { YieldFiguresService } = await import('../yield/yield-figures.service');
  const { FailureParetoService } = await import('../yield/failure-pareto.service');
  const { QuantityStatsService } = await import('../yield/quantity-stats.service');
  const { UnitHistoryService } = await import('../units/unit-history.service');
  const figures = app.get(YieldFiguresService);
  const pareto = app.get(FailureParetoService);
  const quantity = app.get(QuantityStatsService);
  const unitHistory = app.get(UnitHistoryService);

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
  const [{ serial: retestedSerial }] = await sql('select serial from units where id = ?', [retestedUnit]);

  // one statement, as a person who knows the schema would write it: the per-unit rows once (materialized), read
  // for the breakdown, the daily trend and RTY; RTY from run_steps (one narrow row per run and step)
  const figuresSql = (scope: string, scopeParams: unknown[], firstFilter: string, firstParams: unknown[], by: string, label: string) => {
    const head = perUnit(scope, firstFilter);
    const day = `date(fr.started_at / 1000, 'unixepoch', 'localtime')`;
    const statement = `${head}
      select 'g' as part, ${by} as grp, ${label} as label, count(*) as tested, sum(fr.verdict = 'pass') as first_passed,
        sum(fr.last_verdict = 'pass' and u.state <> 'scrapped') as final_passed, null as step_index
      from fr join units u on u.id = fr.unit_id ${label.startsWith('max(d.') ? `join ${by === 'fr.lot_id' ? 'lots' : 'stations'} d on d.id = ${by}` : ''} group by grp
      union all
      select 't', ${day}, ${day}, count(*), sum(fr.verdict = 'pass'), sum(fr.last_verdict = 'pass' and u.state <> 'scrapped'), null
      from fr join units u on u.id = fr.unit_id group by ${day}
      union all
      select 'r', l.step_key, max(l.step_name), sum(x.entered), sum(x.passed), null, min(x.step_index) from (
        select s.step_label_id, min(s.step_index) as step_index, count(*) as entered, sum(s.failed = 0) as passed
        from fr join run_steps s on s.run_id = fr.id group by s.step_label_id
      ) x join step_labels l on l.id = x.step_label_id group by l.step_key`;
    const p = [...scopeParams, ...firstParams];
    const statements: [string, unknown[]][] = [[statement, p]];
    return { statements, run: async () => sql(statement, p) };
  };

  const lotFigures = figuresSql('f.lot_id = ?', [lot.id], '', [], 'fr.station_id', 'max(d.code)');
  const productFigures = figuresSql('f.product_id = ?', [productId], ' and f.started_at >= ?', [fromMs], 'fr.lot_id', 'max(d.code)');

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

  // the values in production order with their limits, one pass (the limit sets are grouped by the reader); CROSS
  // JOIN keeps SQLite on the filtered runs first (else it may walk the quantity's index over the whole history)
  const valuesSql = (where: string, params: unknown[]) => {
    const statements: [string, unknown[]][] = [
      [
        `select m.value, m.low_limit, m.high_limit, m.guarded_low, m.guarded_high, m.unit, m.name, m.step_name, r.started_at
         from test_runs r cross join measurements m on m.run_id = r.id where r.verdict in ('pass', 'fail') and m.step_key = ? and m.quantity = ? and m.value is not null and ${where}
         order by r.started_at, r.id, m.id`,
        [step, qty, ...params],
      ],
    ];
    return { statements, run: async () => sql(...statements[0]) };
  };
  const lotValues = valuesSql('r.lot_id = ?', [lot.id]);
  const productValues = valuesSql('r.product_id = ? and r.started_at >= ?', [productId, fromMs]);
  const chartStatement: [string, unknown[]] = [
    `select m.value, u.serial, r.id, m.name, m.unit from test_runs r join measurements m on m.run_id = r.id join units u on u.id = r.unit_id
     where r.verdict in ('pass', 'fail') and r.product_id = ? and m.step_key = ? and m.quantity = ? and m.value is not null
     order by r.started_at desc, r.id desc, m.id desc limit 200`,
    [productId, step, qty],
  ];
  // GET /api/units/:serial/history: the unit with its lot and product, its runs with plan version, station,
  // fixture and operator, their measurements, and the audit events of the unit and its runs
  const historyStatements: [string, unknown[]][] = [
    [
      'select un.id, un.serial, un.state, un.test_count, un.sent_to_repair_at, l.id, l.code, l.state, p.id, p.part_number, p.name ' +
        'from units un join lots l on l.id = un.lot_id join products p on p.id = un.product_id where un.serial = ?',
      [retestedSerial],
    ],
    [
      'select r.id, r.attempt, r.verdict, r.end_reason, r.error_message, r.failed_step_key, r.started_at, r.finished_at, r.override_reason, r.fixture_identity, ' +
        'r.fixture_calibration_due_at, r.calibration_id, r.operator_name, v.id, v.plan_id, v.version, v.checksum, tp.code, s.id, s.code, s.name, f.id, f.code, ' +
        'f.calibrated_at, f.calibration_due_at, f.calibration_certificate, o.username, o.display_name from test_runs r join plan_versions v on v.id = r.plan_version_id ' +
        'join test_plans tp on tp.id = v.plan_id join stations s on s.id = r.station_id join fixtures f on f.id = r.fixture_id left join users o on o.id = r.operator_id ' +
        'where r.unit_id = ? order by r.started_at desc, r.id desc',
      [retestedUnit],
    ],
    [
      'select m.id, m.run_id, m.step_index, m.step_key, m.step_name, m.quantity, m.name, m.value, m.unit, m.low_limit, m.high_limit, m.guarded_low, m.guarded_high, ' +
        'm.uncertainty, m.rule, m.verdict, m.decision, m.measured_at from test_runs r join measurements m on m.run_id = r.id where r.unit_id = ? order by m.run_id, m.step_index, m.id',
      [retestedUnit],
    ],
    [
      `select e.* from audit_events e where (e.entity_type = 'unit' and e.entity_id = ?) or (e.entity_type = 'test_run' and e.entity_id in (select cast(id as text) from test_runs where unit_id = ?)) order by e.at desc, e.id desc`,
      [String(retestedUnit), retestedUnit],
    ],
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
      name: "unit history of a retested unit (2 runs, 28 measurements)",
      service: () => unitHistory.history(String(retestedSerial)),
      sql: async () => {
        const out = [];
        for (const [s, p] of historyStatements) out.push(await sql(s, p));
        return out;
      },
      plans: historyStatements,
    },
  ];
}
