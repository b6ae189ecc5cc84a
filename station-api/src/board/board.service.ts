import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { RunEngineService } from '../runs/run-engine.service';
import { RunVerdict, TestRun } from '../runs/test-run.entity';
import { Station } from '../stations/station.entity';
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
    const stations = await em.find(Station, { active: true }, { populate: ['fixture', 'activeLot.product'], orderBy: { code: 'asc' } });
    const shift = await this.shifts.forStations(stations.map((s) => s.id));
    const entries: BoardEntryDto[] = [];
    for (const s of stations) {
      const status = await this.engine.statusOfLoaded(s, em);
      entries.push({
        station: { id: s.id, code: s.code, name: s.name },
        state: status.state,
        reasons: status.reasons,
        warnings: status.warnings,
        fixture: s.fixture ? { code: s.fixture.code, calibrationDueAt: s.fixture.calibrationDueAt.toISOString() } : null,
        activeLot: s.activeLot ? { id: s.activeLot.id, code: s.activeLot.code, partNumber: s.activeLot.product.partNumber } : null,
        currentRun: status.currentRunId ? await this.currentRun(em, s.id, status.currentRunId) : null,
        lastRuns: await this.lastRuns(em, s.id, new Date(shift.get(s.id)!.shiftStart)),
        shift: shift.get(s.id)!,
      });
    }
    return entries;
  }

  private async currentRun(em: EntityManager, stationId: number, runId: number): Promise<BoardCurrentRunDto | null> {
    const run = await em.findOne(TestRun, { id: runId }, { populate: ['unit', 'planVersion'] });
    if (!run) return null;
    const steps = run.planVersion.steps;
    // before the first step:started event the run is setting the fixture up for step 0
    const stepIndex = this.progress.progressOf(stationId, runId)?.stepIndex ?? 0;
    return {
      id: run.id,
      serial: run.unit.serial,
      stepIndex,
      stepCount: steps.length,
      stepName: steps[stepIndex]?.name ?? null,
      startedAt: run.startedAt.toISOString(),
    };
  }

  /** The station's latest finished runs of the shift running now: a wall screen must not show last week's. */
  private async lastRuns(em: EntityManager, stationId: number, shiftStart: Date): Promise<BoardLastRunDto[]> {
    const runs = await em.find(
      TestRun,
      { station: stationId, verdict: { $ne: RunVerdict.Running }, finishedAt: { $ne: null, $gte: shiftStart } },
      { populate: ['unit'], orderBy: { finishedAt: 'desc', id: 'desc' }, limit: BOARD_LAST_RUNS },
    );
    return runs.map((r) => ({
      id: r.id,
      serial: r.unit.serial,
      verdict: r.verdict,
      failedStepKey: r.failedStepKey ?? null,
      finishedAt: r.finishedAt!.toISOString(),
    }));
  }
}
