import { EntityManager } from '@mikro-orm/sqlite';
import type { JudgedRow } from '../measure/judging';
import type { MeasurementView } from '../realtime/station-events';
import { toMeasurementView } from './run-views';

/** Column order of {@link MeasurementStore.store}; names as the migrations create them. */
const INSERT_MEASUREMENT =
  'insert into `measurements` (`created_at`, `updated_at`, `run_id`, `step_index`, `step_key`, `step_name`, `quantity`, `name`, ' +
  '`value`, `unit`, `low_limit`, `high_limit`, `guarded_low`, `guarded_high`, `uncertainty`, `rule`, `verdict`, `decision`, `raw`, `started_at`, `measured_at`) ' +
  'values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)';

/**
 * Writes judged measurements. Each is a single INSERT (its own transaction, autocommit), written once and
 * never updated: a measured result is never lost or altered.
 */
export class MeasurementStore {
  constructor(private readonly em: EntityManager) {}

  /**
   * Stores one judged measurement. One parameterised statement rather than the unit of work: the ORM's
   * per-row mapping was the largest cost left in the engine's hot path (see docs/performance.md). Dates
   * are stored as epoch milliseconds and JSON as text, as the ORM does on SQLite.
   */
  async store(runId: number, row: JudgedRow): Promise<MeasurementView> {
    const now = Date.now();
    const result = await this.em.getConnection().execute<{ insertId: number }>(
      INSERT_MEASUREMENT,
      [
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
      ],
      'run',
    );
    return toMeasurementView({ ...row, id: Number(result.insertId) }, runId);
  }
}
