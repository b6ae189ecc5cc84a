import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { CalibrationRecord } from '../fixtures/calibration/calibration-record.entity';
import { toCalibrationDto } from '../fixtures/calibration/calibrations.service';
import { currentCalibration } from '../fixtures/calibration/current-calibration';
import type { CalibrationRecordDto } from '../fixtures/dto/calibration.dto';
import type { RunDetailDto, RunListDto, RunsQueryDto } from './dto/runs.dto';
import type { PlanStep } from '../plans/plan-definition';
import { RunRefusal } from './run-refusal';
import { groupSql, pageRunIds, runGroups, type SqlExec } from './run-list-order';
import { failedStepNames, MEASUREMENT_VIEW_SELECT, RUN_VIEW_SELECT, rowToMeasurementView, rowToRunView, runFilterSql, runOrderSql } from './run-queries';

/**
 * The run view with test_runs as the outer loop (CROSS JOIN keeps SQLite's join order as written), so the page's
 * runs are found by their ids first: on a small history the planner otherwise started from the plan versions.
 */
const RUNS_FIRST_VIEW_SELECT = RUN_VIEW_SELECT.replace(/(?<!left) join /g, ' cross join ');

/** Read side of runs: lists with filters and one run with every measurement. */
@Injectable()
export class RunsService {
  /** Steps of the plan versions the listed runs used, by `id:checksum` (a few versions a year; bounded) */
  private readonly stepsByVersion = new Map<string, PlanStep[]>();

  constructor(private readonly em: EntityManager) {}

  /**
   * Newest first unless sorted by another whitelisted column. `to` is exclusive so consecutive windows do not
   * overlap. `serial` matches any part, any case. Each run carries its failed step's name for people to read.
   * Newest first is one statement; any other order finds the page's ids from an index (run-list-order.ts), then
   * reads and joins only those runs.
   */
  async list(q: RunsQueryDto): Promise<RunListDto> {
    const conn = this.em.getConnection();
    const exec: SqlExec = (sql, params) => conn.execute<Record<string, unknown>[]>(sql, params);
    const { where, params } = runFilterSql(q);
    // the count needs no join: every filter is on test_runs itself (the serial through a sub-select)
    const [{ total }] = await exec(`select count(*) as total from test_runs r${where}`, params);
    const page = { ...q, limit: q.limit ?? 50, offset: q.offset ?? 0 };
    const rows = await this.pageRows(exec, page, Number(total));
    if (rows.length === 0) return { items: [], total: Number(total) };
    const failed = rows
      .filter((r) => r.failed_step_key !== null && r.failed_step_key !== undefined)
      .map((r) => ({ id: Number(r.id), planVersionId: Number(r.plan_version_id), failedStepKey: String(r.failed_step_key), checksum: String(r.plan_checksum) }));
    const steps = new Map<number, PlanStep[]>();
    const missing = new Set<number>();
    for (const r of failed) {
      // a version's steps are fixed by its checksum: a changed version has another checksum and is read again
      const known = this.stepsByVersion.get(`${r.planVersionId}:${r.checksum}`);
      if (known) steps.set(r.planVersionId, known);
      else missing.add(r.planVersionId);
    }
    if (missing.size > 0) {
      const ids = [...missing];
      for (const v of await exec(`select id, checksum, steps from plan_versions where id in (${ids.map(() => '?').join(', ')})`, ids)) {
        const parsed = (typeof v.steps === 'string' ? JSON.parse(v.steps) : v.steps) as PlanStep[];
        steps.set(Number(v.id), parsed);
        if (this.stepsByVersion.size >= 500) this.stepsByVersion.clear();
        this.stepsByVersion.set(`${Number(v.id)}:${String(v.checksum)}`, parsed);
      }
    }
    const names = failedStepNames(failed, steps);
    return { items: rows.map((r) => ({ ...rowToRunView(r), failedStepName: names.get(Number(r.id)) ?? null })), total: Number(total) };
  }

  /**
   * The rows of one page, in list order. Newest first (the default, and every filter the floor uses) is one
   * statement: the walk's own statement for that order (one group) picks the page's ids inside it, then their
   * rows are joined by id and put in order. Every other order finds the page's ids first (pageRunIds), then reads
   * their rows.
   */
  private async pageRows(exec: SqlExec, q: RunsQueryDto & { limit: number; offset: number }, total: number): Promise<Record<string, unknown>[]> {
    if (q.offset >= total) return [];
    if ((q.sort ?? 'startedAt') === 'startedAt' && (q.dir ?? 'desc') === 'desc') {
      const filter = runFilterSql(q);
      const [newest] = (await runGroups(exec, 'startedAt', 'desc', filter))!;
      const page = groupSql(newest, filter);
      return exec(`${RUNS_FIRST_VIEW_SELECT} where r.id in (${page.sql})${runOrderSql('startedAt', 'desc')}`, [...page.params, q.limit, q.offset]);
    }
    const ids = await pageRunIds(exec, q, total);
    if (ids.length === 0) return [];
    const marks = ids.map(() => '?').join(', ');
    const byId = new Map<number, Record<string, unknown>>((await exec(`${RUN_VIEW_SELECT} where r.id in (${marks})`, ids)).map((r) => [Number(r.id), r]));
    return ids.flatMap((id): Record<string, unknown>[] => {
      const r = byId.get(id);
      return r ? [r] : [];
    });
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
