import { EntityManager } from '@mikro-orm/sqlite';
import type { JudgedRow } from '../measure/judging';
import type { MeasurementView } from '../realtime/station-events';
import { toMeasurementView } from './run-views';

/** Columns of one stored measurement, in the order {@link measurementParams} gives the values; names as the migrations create them. */
const COLUMNS =
  '`created_at`, `updated_at`, `run_id`, `step_index`, `step_key`, `step_name`, `quantity`, `name`, ' +
  '`value`, `unit`, `low_limit`, `high_limit`, `guarded_low`, `guarded_high`, `uncertainty`, `rule`, `verdict`, `decision`, `raw`, `started_at`, `measured_at`';
const PLACEHOLDERS = `(${Array.from({ length: 21 }, () => '?').join(', ')})`;

/**
 * The INSERT of `count` measurements as ONE statement: SQLite runs a single statement, with the work of the
 * view's INSTEAD OF trigger (Migration20261203010000), as one transaction. No RETURNING: on a view it gives a
 * null id for every row (SQLite 3.44); {@link MeasurementStore.storeStep} reads the ids after the commit.
 */
export function insertMeasurementsSql(count: number): string {
  return `insert into \`measurements\` (${COLUMNS}) values ${Array.from({ length: count }, () => PLACEHOLDERS).join(', ')}`;
}

/** The ids of the latest `count` measurements of one step of one run, newest first (a run's rows are found by the values table's run index). */
const STEP_IDS_SQL =
  'select v.`id` as `id` from `measurement_values` v join `measurement_defs` d on d.`id` = v.`def_id` ' +
  'where v.`run_id` = ? and d.`step_index` = ? order by v.`id` desc limit ?';

/** The values of one row of {@link insertMeasurementsSql}: dates as epoch milliseconds and JSON as text, as the ORM stores them on SQLite. */
export function measurementParams(runId: number, row: JudgedRow, now: number): unknown[] {
  return [
    now,
    now,
    runId,
    row.stepIndex,
    row.stepKey,
    row.stepName,
    row.quantity,
    row.name,
    row.value ?? null,
    row.unit,
    row.lowLimit ?? null,
    row.highLimit ?? null,
    row.guardedLow ?? null,
    row.guardedHigh ?? null,
    row.uncertainty,
    row.rule,
    row.verdict,
    row.decision,
    JSON.stringify(row.raw),
    row.startedAt.getTime(),
    row.measuredAt.getTime(),
  ];
}

/**
 * Writes judged measurements, once, never updated: a measured result is never lost or altered.
 *
 * A step's measurements are committed together: one multi-row INSERT, which SQLite runs as one transaction
 * (all rows or none) with one durable commit. One statement rather than BEGIN … COMMIT because the pool
 * holds a single connection shared with every request: an open transaction would make the screens wait,
 * and statements of other requests could otherwise land inside it. One parameterised statement rather than
 * the unit of work: the ORM's per-row mapping was the largest cost in the engine's hot path
 * (docs/performance.md).
 */
export class MeasurementStore {
  constructor(private readonly em: EntityManager) {}

  /** Stores all judged rows of one step in one transaction; resolves with their views once committed. */
  async storeStep(runId: number, rows: readonly JudgedRow[]): Promise<MeasurementView[]> {
    if (rows.length === 0) return [];
    const stepIndex = rows[0].stepIndex;
    if (rows.some((r) => r.stepIndex !== stepIndex)) throw new Error('one step at a time: rows of several steps given');
    const now = Date.now();
    const params = rows.flatMap((row) => measurementParams(runId, row, now));
    const conn = this.em.getConnection();
    await conn.execute(insertMeasurementsSql(rows.length), params, 'run');
    // committed; the ids are read before anything about the step is shown. Only this run's engine writes
    // this run's rows, and the trigger inserts the rows in the order given with growing AUTOINCREMENT ids,
    // so the step's newest ids, ascending, are the rows in order (a step repeated in a run is stored again
    // with larger ids)
    const ids = await conn.execute<{ id: number }[]>(STEP_IDS_SQL, [runId, stepIndex, rows.length], 'all');
    if (ids.length !== rows.length) throw new Error(`stored ${ids.length} of ${rows.length} measurements`);
    const sorted = ids.map((r) => Number(r.id)).sort((a, b) => a - b);
    return rows.map((row, i) => toMeasurementView({ ...row, id: sorted[i] }, runId));
  }
}
