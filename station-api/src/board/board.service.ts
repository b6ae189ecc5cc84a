import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { RunEngineService } from '../runs/run-engine.service';
import type { PlanStep } from '../plans/plan-definition';
import type { RunVerdictName } from '../realtime/station-events';
import type { BoardCurrentRunDto, BoardEntryDto, BoardLastRunDto } from './dto/board.dto';
import { RunProgressTracker } from './run-progress.tracker';
import { ShiftSummaryService } from '../shift/shift-summary.service';

/** How many finished runs each board tile lists. */
export const BOARD_LAST_RUNS = 8;

/**
 * One snapshot of every active station for the line board. State and reasons come from the run engine
 * (the same computation as GET /api/stations/:id/status); live events then keep the board current.
 */
@Injectable()
export class BoardService {
  constructor(
    private readonly em: EntityManager,
    private readonly engine: RunEngineService,
    private readonly shifts: ShiftSummaryService,
    private readonly progress: RunProgressTracker,
  ) {}

  async snapshot(): Promise<BoardEntryDto[]> {
    const em = this.em.fork();
    // state and reasons by the status route's rule, from plain rows: two statements for all stations
    const stations = await this.engine.stationStatus.statusesOfStations(em, true);
    const shift = await this.shifts.forStations(stations.map((s) => s.facts.id));
    const entries: BoardEntryDto[] = [];
    for (const { facts: s, status } of stations) {
      entries.push({
        station: { id: s.id, code: s.code, name: s.name },
        state: status.state,
        reasons: status.reasons,
        warnings: status.warnings,
        fixture: s.fixture ? { code: s.fixture.code, calibrationDueAt: s.fixture.calibrationDueAt.toISOString() } : null,
        activeLot: s.lot ? { id: s.lot.id, code: s.lot.code, partNumber: s.lot.partNumber } : null,
        currentRun: status.currentRunId ? await this.currentRun(em, s.id, status.currentRunId) : null,
        lastRuns: await this.lastRuns(em, s.id, new Date(shift.get(s.id)!.shiftStart)),
        shift: shift.get(s.id)!,
      });
    }
    return entries;
  }

  /*
   * The current run and the last runs are read with hand-written SQL, only the columns the board shows:
   * the ORM's findOne / find with populate cost ~10x the SQL once a year of history is stored (issue 11,
   * docs/performance.md). The last runs use the index test_runs(station_id, finished_at).
   */

  private async currentRun(em: EntityManager, stationId: number, runId: number): Promise<BoardCurrentRunDto | null> {
    const [run] = await em
      .getConnection()
      .execute<{ id: number; serial: string; started_at: number; steps: string | PlanStep[] }[]>(
        'select r.id, u.serial, r.started_at, pv.steps from test_runs r join units u on u.id = r.unit_id join plan_versions pv on pv.id = r.plan_version_id where r.id = ?',
        [runId],
      );
    if (!run) return null;
    const steps = (typeof run.steps === 'string' ? JSON.parse(run.steps) : run.steps) as PlanStep[];
    // before the first step:started event the run is setting the fixture up for step 0
    const stepIndex = this.progress.progressOf(stationId, runId)?.stepIndex ?? 0;
    return {
      id: Number(run.id),
      serial: run.serial,
      stepIndex,
      stepCount: steps.length,
      stepName: steps[stepIndex]?.name ?? null,
      startedAt: new Date(Number(run.started_at)).toISOString(),
    };
  }

  /** The station's latest finished runs of the shift running now: a wall screen must not show last week's. */
  private async lastRuns(em: EntityManager, stationId: number, shiftStart: Date): Promise<BoardLastRunDto[]> {
    const runs = await em
      .getConnection()
      .execute<{ id: number; serial: string; verdict: RunVerdictName; failed_step_key: string | null; finished_at: number }[]>(
        'select r.id, u.serial, r.verdict, r.failed_step_key, r.finished_at from test_runs r join units u on u.id = r.unit_id ' +
          "where r.station_id = ? and r.verdict <> 'running' and r.finished_at is not null and r.finished_at >= ? " +
          'order by r.finished_at desc, r.id desc limit ?',
        [stationId, shiftStart.getTime(), BOARD_LAST_RUNS],
      );
    return runs.map((r) => ({
      id: Number(r.id),
      serial: r.serial,
      verdict: r.verdict,
      failedStepKey: r.failed_step_key ?? null,
      finishedAt: new Date(Number(r.finished_at)).toISOString(),
    }));
  }
}
