import { raw, UniqueConstraintViolationException } from '@mikro-orm/core';
import { EntityManager } from '@mikro-orm/sqlite';
import { Logger } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import { Fixture } from '../fixtures/fixture.entity';
import type { RunEndReasonName } from '../realtime/station-events';
import { Unit, UnitState } from '../units/unit.entity';
import { Measurement } from './measurement.entity';
import { unitBusy } from './run-preconditions';
import { RunRefusal } from './run-refusal';
import type { RunOutcome } from './run-types';
import { RunEndReason, RunVerdict, TestRun } from './test-run.entity';

/** The columns of a new run row (ids of its records and the snapshot taken at the start). */
export interface NewRun {
  unitId: number;
  serial: string;
  lotId: number;
  productId: number;
  stationId: number;
  stationCode: string;
  fixtureId: number;
  planVersionId: number;
  operatorId: number;
  operatorName: string;
  attempt: number;
  startedAt: Date;
  fixtureIdentity: string;
  fixtureCalibrationDueAt: Date;
  fixtureContactCycles: number;
  overrideReason?: string;
  /** The calibration record the run is judged with, if the fixture has one */
  calibrationId?: number | null;
}

/** A run closed at start-up because the server stopped during it. */
export interface InterruptedRun {
  runId: number;
  stationId: number;
  serial: string;
  message: string;
}

const timeFmt = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit', second: '2-digit', hour12: false, timeZone: 'UTC' });

/**
 * The run rows: written when a run starts, closed with its verdict when it ends, and closed as interrupted
 * at start-up when the server stopped during one. Native statements on fresh forks: nothing else is
 * flushed, and each write costs one or two statements.
 */
export class RunRecords {
  private readonly logger = new Logger(RunRecords.name);

  constructor(
    private readonly em: EntityManager,
    private readonly audit?: AuditService,
  ) {}

  /**
   * Writes the run row and the fixture's contact cycle (one per clamped unit) in one transaction. The
   * database holds at most one running run per unit and per station (partial unique indexes): a start that
   * loses that race is refused as busy, and nothing of it is kept.
   */
  async open(r: NewRun): Promise<number> {
    const now = new Date();
    try {
      return Number(
        await this.em.fork().transactional(async (tx) => {
          await tx.nativeUpdate(Fixture, { id: r.fixtureId }, { contactCyclesUsed: raw('contact_cycles_used + 1'), updatedAt: now } as never);
          return tx.insert(TestRun, {
            unit: r.unitId,
            lot: r.lotId,
            product: r.productId,
            station: r.stationId,
            fixture: r.fixtureId,
            planVersion: r.planVersionId,
            operator: r.operatorId,
            operatorName: r.operatorName,
            attempt: r.attempt,
            verdict: RunVerdict.Running,
            startedAt: r.startedAt,
            fixtureIdentity: r.fixtureIdentity,
            fixtureCalibrationDueAt: r.fixtureCalibrationDueAt,
            fixtureContactCycles: r.fixtureContactCycles,
            calibration: r.calibrationId ?? undefined,
            overrideReason: r.overrideReason,
            overrideBy: r.overrideReason ? r.operatorId : undefined,
            createdAt: now,
            updatedAt: now,
          } as never);
        }),
      );
    } catch (err) {
      if (err instanceof UniqueConstraintViolationException) {
        // SQLite names the column of the index that refused: "UNIQUE constraint failed: test_runs.station_id"
        if (/constraint failed: test_runs\.station_id/.test(err.message)) {
          throw new RunRefusal('station_busy', `Station ${r.stationCode} is already testing another unit; wait for it to finish.`);
        }
        throw unitBusy(r.serial);
      }
      throw err;
    }
  }

  /**
   * Stores the verdict. A judged run counts as a test of the unit and sets its state; an interrupted run
   * counts as an attempt without judging the unit; an error or abort leaves the unit as it was.
   * @returns whether the unit was counted (the caller updates its view)
   */
  async close(
    runId: number,
    unitId: number,
    o: Pick<RunOutcome, 'verdict' | 'failedStepKey' | 'errorMessage' | 'endReason'>,
    finishedAt: Date,
  ): Promise<boolean> {
    const judged = o.verdict === RunVerdict.Pass || o.verdict === RunVerdict.Fail;
    try {
      const now = new Date();
      await this.em.fork().transactional(async (tx) => {
        await tx.nativeUpdate(
          TestRun,
          { id: runId },
          {
            verdict: o.verdict,
            finishedAt,
            failedStepKey: o.verdict === RunVerdict.Fail ? (o.failedStepKey ?? null) : null,
            errorMessage: o.errorMessage ?? null,
            endReason: o.endReason ?? null,
            updatedAt: now,
          } as never,
        );
        if (judged) {
          await tx.nativeUpdate(
            Unit,
            { id: unitId },
            {
              state: o.verdict === RunVerdict.Pass ? UnitState.Passed : UnitState.Failed,
              testCount: raw('test_count + 1'),
              lastTestedAt: finishedAt,
              updatedAt: now,
            } as never,
          );
        }
      });
      return judged;
    } catch (err) {
      this.logger.error(`Run ${runId}: could not store the verdict ${o.verdict}: ${(err as Error).message}`);
      return false;
    }
  }

  /**
   * Closes every run left `running` by a server that stopped during it (a crash, a power cut, kill -9):
   * verdict `error`, end reason `interrupted`, a message saying when and where it stopped (its last stored
   * measurement tells), counted as an attempt of the unit (which it never passes), its measurements kept,
   * and audited. Call before the server accepts work; runs this process is driving (`live`) are left alone.
   */
  async recoverInterrupted(live: ReadonlySet<number> = new Set()): Promise<InterruptedRun[]> {
    const em = this.em.fork();
    const found = await em.find(TestRun, { verdict: RunVerdict.Running }, { populate: ['unit', 'station'], orderBy: { id: 'asc' } });
    const runs = found.filter((r) => !live.has(r.id));
    const closed: InterruptedRun[] = [];
    for (const run of runs) {
      const last = await em.findOne(Measurement, { run: run.id }, { orderBy: { measuredAt: 'desc', id: 'desc' } });
      const stoppedAt = last?.measuredAt ?? run.startedAt;
      const where = last ? ` during step ${last.stepIndex + 1} (${last.stepName})` : ' before its first measurement';
      const message = `Interrupted: station server stopped at ${timeFmt.format(stoppedAt)} UTC${where}. The unit was not judged; this counts as an attempt.`;
      const now = new Date();
      await em.transactional(async (tx) => {
        await tx.nativeUpdate(
          TestRun,
          { id: run.id, verdict: RunVerdict.Running },
          { verdict: RunVerdict.Error, endReason: RunEndReason.Interrupted, errorMessage: message, finishedAt: stoppedAt, updatedAt: now } as never,
        );
        // an attempt used, never a pass: the unit's state stays as it was
        await tx.nativeUpdate(Unit, { id: run.unit.id }, { testCount: raw('test_count + 1'), updatedAt: now } as never);
        if (this.audit) {
          await this.audit.record(
            {
              action: 'run.interrupted',
              entityType: 'test_run',
              entityId: run.id,
              reason: message,
              before: { verdict: 'running' },
              after: { verdict: 'error', endReason: 'interrupted' satisfies RunEndReasonName, serial: run.unit.serial, station: run.station.code },
            },
            tx,
          );
        }
      });
      this.logger.warn(`Run ${run.id} (${run.unit.serial} on ${run.station.code}): ${message}`);
      closed.push({ runId: run.id, stationId: run.station.id, serial: run.unit.serial, message });
    }
    return closed;
  }
}
