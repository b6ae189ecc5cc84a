import { EntityManager } from '@mikro-orm/sqlite';
import type { JudgedRow } from '../measure/judging';
import type { MeasurementView } from '../realtime/station-events';
import { toMeasurementView } from './run-views';

/** Columns of one stored measurement, in the order {@link measurementParams} gives the values; names as the migrations create them. */
const COLUMNS =
  '`created_at`, `updated_at`, `run_id`, `step_index`, `step_key`, `step_name`, `quantity`, `name`, ' +
  '`value`, `unit`, `low_limit`, `high_limit`, `guarded_low`, `guarded_high`, `uncertainty`, `rule`, `verdict`, `decision`, `raw`, `started_at`, `measured_at`';
const PLACEHOLDERS = `(${Array.from({ length: 21 }, () => '?').join(', ')})`;

/** The INSERT of `count` measurements as ONE statement: SQLite runs a single statement as one transaction. */
export function insertMeasurementsSql(count: number): string {
  return `insert into \`measurements\` (${COLUMNS}) values ${Array.from({ length: count }, () => PLACEHOLDERS).join(', ')} returning \`id\``;
}

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
    const now = Date.now();
    const params = rows.flatMap((row) => measurementParams(runId, row, now));
    const ids = await this.em.getConnection().execute<{ id: number }[]>(insertMeasurementsSql(rows.length), params, 'all');
    if (ids.length !== rows.length) throw new Error(`stored ${ids.length} of ${rows.length} measurements`);
    // AUTOINCREMENT ids grow within the statement, so ascending ids are the rows in the order given
    // (SQLite does not promise the order of RETURNING rows)
    const sorted = ids.map((r) => Number(r.id)).sort((a, b) => a - b);
    return rows.map((row, i) => toMeasurementView({ ...row, id: sorted[i] }, runId));
  }
}
