import type { INestApplicationContext } from '@nestjs/common';
import type { BuiltHistory } from './floor-bench-build';

/**
 * The questions `bench:floor` times: each through the service the HTTP route calls, and answered by hand-written
 * SQL on the same connection. Not product code.
 */
export interface FloorQuestion {
  name: string;
  service?: (i: number) => Promise<unknown>;
  sql: (i: number) => Promise<unknown>;
}

type Sql = (q: string, p?: unknown[]) => Promise<Record<string, unknown>[]>;

export async function floorQuestions(app: INestApplicationContext, sql: Sql, built: BuiltHistory): Promise<FloorQuestion[]> {
  const { RunsService } = await import('../runs/runs.service');
  const { BoardService } = await import('../board/board.service');
  const { ShiftSummaryService } = await import('../shift/shift-summary.service');
  const { RepairQueueService } = await import('../repair/repair-queue.service');
  const { RUN_VIEW_SELECT, RUN_SORT_KEYS, runOrderSql } = await import('../runs/run-queries');
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
  // the hand-written list: one statement with the view's joins, newest first (the started_at index), and its COUNT
  const runList =
    (where: string, p: unknown[], order = ' order by r.started_at desc, r.id desc') =>
    async () => {
      await sql(`${RUN_VIEW_SELECT}${where}${order} limit 50 offset 0`, p);
      await sql(`select count(*) as total from test_runs r${where}`, p);
    };
  const like = `%${serialPart}%`;
  const questions: FloorQuestion[] = [
    { name: 'runs list, unfiltered', service: () => runs.list({}), sql: runList('', []) },
    { name: 'runs list, by lot', service: () => runs.list({ lotId: lot.id }), sql: runList(' where r.lot_id = ?', [lot.id]) },
    { name: 'runs list, by station', service: () => runs.list({ stationId: station.id }), sql: runList(' where r.station_id = ?', [station.id]) },
    { name: 'runs list, by verdict (fail)', service: () => runs.list({ verdict: 'fail' }), sql: runList(" where r.verdict = 'fail'", []) },
    {
      name: `runs list, by serial part "${serialPart}"`,
      service: () => runs.list({ serial: serialPart }),
      sql: runList(' where r.unit_id in (select id from units where serial like ?)', [like]),
    },
  ];
  // every sort the runs list offers, both ways, unfiltered (the UI's column headers); the SQL is the question
  // written as one statement: ORDER BY over the joined view, as a person would write it (runOrderSql)
  for (const sort of RUN_SORT_KEYS) {
    for (const dir of ['asc', 'desc'] as const) {
      if (sort === 'startedAt' && dir === 'desc') continue; // the unfiltered line above
      questions.push({ name: `runs list, sort ${sort} ${dir}`, service: () => runs.list({ sort, dir }), sql: runList('', [], runOrderSql(sort, dir)) });
    }
  }
  questions.push(
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
        await sql(
          'select s.*, f.code as fixture_code, l.code as lot_code, p.part_number from stations s left join fixtures f on f.id = s.fixture_id left join lots l on l.id = s.active_lot_id left join products p on p.id = l.product_id where s.active = 1 order by s.code',
        );
        await sql("select distinct tp.product_id from test_plans tp join plan_versions pv on pv.plan_id = tp.id where pv.state = 'released' and pv.retired_at is null");
        for (const id of stationIds) {
          await sql(
            "select r.id, u.serial, r.verdict, r.failed_step_key, r.finished_at from test_runs r join units u on u.id = r.unit_id where r.station_id = ? and r.verdict <> 'running' and r.finished_at is not null and r.finished_at >= ? order by r.finished_at desc, r.id desc limit 8",
            [id, window.start.getTime()],
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
            'from units u join lots l on l.id = u.lot_id join products p on p.id = u.product_id ' +
            "left join test_runs r on r.id = (select r2.id from test_runs r2 where r2.unit_id = u.id and r2.verdict = 'fail' order by r2.finished_at desc, r2.id desc limit 1) " +
            "left join stations s on s.id = r.station_id where u.state in ('failed', 'in_repair') order by r.finished_at, u.id limit 200",
        ),
    },
    // yield questions (SQL only; the statistics must not make them worse)
    { name: 'COUNT of all runs', sql: () => sql('select count(*) from test_runs r') },
    {
      name: `lot mean and sd of ${String(q.quantity)}`,
      sql: () =>
        sql('select count(*), avg(m.value), avg(m.value * m.value) from measurements m join test_runs r on r.id = m.run_id where r.lot_id = ? and m.step_key = ? and m.quantity = ?', [
          lot.id,
          q.step_key,
          q.quantity,
        ]),
    },
    {
      name: `trend of ${String(q.quantity)}, last 30 days`,
      sql: () => sql('select measured_at, value from measurements where step_key = ? and quantity = ? and measured_at >= ? order by measured_at', [q.step_key, q.quantity, Date.now() - 30 * 86400_000]),
    },
    { name: 'first-pass yield by lot (one lot)', sql: () => sql("select count(*), sum(verdict = 'pass') from test_runs where lot_id = ? and attempt = 1", [lot.id]) },
  );
  return questions;
}
