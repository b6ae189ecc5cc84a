import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { CalibrationRecord } from '../fixtures/calibration/calibration-record.entity';
import { toCalibrationDto } from '../fixtures/calibration/calibrations.service';
import { currentCalibration } from '../fixtures/calibration/current-calibration';
import type { CalibrationRecordDto } from '../fixtures/dto/calibration.dto';
import type { RunDetailDto, RunListDto, RunsQueryDto } from './dto/runs.dto';
import type { PlanStep } from '../plans/plan-definition';
import { RunRefusal } from './run-refusal';
import { FAILED_STEP_NAME_SQL, MEASUREMENT_VIEW_SELECT, RUN_VIEW_SELECT, rowToMeasurementView, rowToRunView, runFilterSql, runOrderSql } from './run-queries';

/** Read side of runs: lists with filters and one run with every measurement. */
@Injectable()
export class RunsService {
  constructor(private readonly em: EntityManager) {}

  /**
   * Newest first unless sorted by another whitelisted column. `to` is exclusive so consecutive windows do not
   * overlap. `serial` matches any part, any case. Each run carries its failed step's name for people to read.
   */
  async list(q: RunsQueryDto): Promise<RunListDto> {
    const conn = this.em.getConnection();
    const { where, params } = runFilterSql(q);
    const rows = await conn.execute<Record<string, unknown>[]>(
      `${RUN_VIEW_SELECT}${where}${runOrderSql(q.sort, q.dir ?? (q.sort && q.sort !== 'startedAt' ? 'asc' : 'desc'))} limit ? offset ?`,
      [...params, q.limit ?? 50, q.offset ?? 0],
    );
    // the count needs no join: every filter is on test_runs itself (the serial through a sub-select)
    const [{ total }] = await conn.execute<{ total: number }[]>(`select count(*) as total from test_runs r${where}`, params);
    const ids = rows.map((r) => Number(r.id));
    const names = new Map<number, string>();
    if (ids.length > 0) {
      for (const n of await conn.execute<{ id: number; name: string | null }[]>(FAILED_STEP_NAME_SQL(ids.length), ids)) {
        if (n.name !== null) names.set(Number(n.id), String(n.name));
      }
    }
    return { items: rows.map((r) => ({ ...rowToRunView(r), failedStepName: names.get(Number(r.id)) ?? null })), total: Number(total) };
  }

  async get(id: number): Promise<RunDetailDto> {
    const conn = this.em.getConnection();
    const [row] = await conn.execute<Record<string, unknown>[]>(
      `${RUN_VIEW_SELECT.replace(' from test_runs r ', ', pv.steps as plan_steps, r.calibration_id from test_runs r ')} where r.id = ?`,
      [id],
    );
    if (!row) throw new RunRefusal('run_not_found', `There is no run with id ${id}.`);
    const measurements = await conn.execute<Record<string, unknown>[]>(`${MEASUREMENT_VIEW_SELECT} where run_id = ? order by step_index, id`, [id]);
    const steps = (typeof row.plan_steps === 'string' ? JSON.parse(row.plan_steps) : row.plan_steps) as PlanStep[];
    const view = rowToRunView(row);
    return {
      ...view,
      measurements: measurements.map((m) => rowToMeasurementView(m, id)),
      steps: steps.map((s) => ({ key: s.key, name: s.name, kind: s.kind, limits: s.limits })),
      calibration: await this.calibrationOfRun(row.calibration_id, view.fixtureId),
    };
  }

  /**
   * The calibration record a run was judged with, as the fixtures page shows it (`current` says whether it is
   * still the fixture's calibration in force). Null for runs from before calibration records were kept
   * (Migration20261202151000 left their `calibration_id` empty) and for a fixture that had no record.
   */
  private async calibrationOfRun(calibrationId: unknown, fixtureId: number): Promise<CalibrationRecordDto | null> {
    if (calibrationId === null || calibrationId === undefined) return null;
    // the recorder's name only: a run read never touches a password hash (test/run-store.e2e-spec.ts)
    const record = await this.em.findOne(CalibrationRecord, { id: Number(calibrationId) }, { populate: ['recordedBy'], exclude: ['recordedBy.passwordHash'] });
    if (!record) return null;
    const inForce = await currentCalibration(this.em, fixtureId);
    // the view reads the recorder's display name only, never the excluded hash
    return toCalibrationDto(record as CalibrationRecord, inForce?.id);
  }
}
