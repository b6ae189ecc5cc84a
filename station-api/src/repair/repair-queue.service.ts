import { EntityManager, FilterQuery } from '@mikro-orm/sqlite';
import { Injectable, NotFoundException } from '@nestjs/common';
import { Lot } from '../lots/lot.entity';
import { Measurement, MeasurementVerdict } from '../runs/measurement.entity';
import { toMeasuredAgainstLimits } from '../runs/run-views';
import { RunVerdict, TestRun } from '../runs/test-run.entity';
import { Station } from '../stations/station.entity';
import { Unit, UnitState } from '../units/unit.entity';
import type { RepairFailureDto, RepairQueueDto, RepairQueueItemDto, RepairQueueQueryDto } from './dto/repair-queue.dto';
import { repairQueueReason, type RepairQueueReason } from './retest-policy';

/** Attempts per unit when no failing run (with its plan version) is stored, e.g. a state set by hand */
const DEFAULT_MAX_ATTEMPTS = 3;

/**
 * Units waiting for repair under the retest policy (./retest-policy.ts): failed units with no attempts left
 * or sent by the operator, and units in repair; each with its last failing run and that run's first failing
 * measurement. Oldest failure first, as a bench works.
 */
@Injectable()
export class RepairQueueService {
  constructor(private readonly em: EntityManager) {}

  async list(q: RepairQueueQueryDto): Promise<RepairQueueDto> {
    const em = this.em.fork();
    if (q.lotId !== undefined && (await em.count(Lot, { id: q.lotId })) === 0) {
      throw new NotFoundException({ message: `There is no lot with id ${q.lotId}.`, details: { code: 'unknown_lot' } });
    }
    if (q.stationId !== undefined && (await em.count(Station, { id: q.stationId })) === 0) {
      throw new NotFoundException({ message: `There is no station with id ${q.stationId}.`, details: { code: 'unknown_station' } });
    }

    const where: FilterQuery<Unit> = { state: { $in: [UnitState.Failed, UnitState.InRepair] } };
    if (q.lotId !== undefined) where.lot = q.lotId;
    const units = await em.find(Unit, where, { populate: ['lot', 'product'], orderBy: { id: 'asc' } });
    const ids = units.map((u) => u.id);

    const lastFail = new Map<number, TestRun>();
    if (ids.length > 0) {
      const runs = await em.find(
        TestRun,
        { unit: { $in: ids }, verdict: RunVerdict.Fail },
        { populate: ['station', 'planVersion'], orderBy: { finishedAt: 'desc', id: 'desc' } },
      );
      for (const r of runs) if (!lastFail.has(r.unit.id)) lastFail.set(r.unit.id, r);
    }

    let rows = units.flatMap((unit) => {
      const run = lastFail.get(unit.id);
      const reason = repairQueueReason(unit, run?.planVersion.maxAttempts ?? DEFAULT_MAX_ATTEMPTS);
      return reason ? [{ unit, run, reason }] : [];
    });
    if (q.stationId !== undefined) rows = rows.filter((r) => r.run?.station.id === q.stationId);
    // oldest failure first; a unit with no stored failing run (e.g. set by hand) goes last
    rows.sort((a, b) => (a.run?.finishedAt?.getTime() ?? Infinity) - (b.run?.finishedAt?.getTime() ?? Infinity) || a.unit.id - b.unit.id);

    const offset = q.offset ?? 0;
    const page = rows.slice(offset, offset + (q.limit ?? 200));
    const firstFailure = await this.firstFailures(em, page.flatMap((r) => (r.run ? [r.run.id] : [])));

    const items: RepairQueueItemDto[] = page.map(({ unit, run, reason }) => ({
      unitId: unit.id,
      serial: unit.serial,
      state: unit.state as 'failed' | 'in_repair',
      reason: reason as RepairQueueReason,
      sentToRepairAt: unit.sentToRepairAt?.toISOString() ?? null,
      testCount: unit.testCount,
      lot: { id: unit.lot.id, code: unit.lot.code, partNumber: unit.product.partNumber },
      lastFailingRun: run
        ? {
            id: run.id,
            station: { id: run.station.id, code: run.station.code, name: run.station.name },
            attempt: run.attempt,
            failedStepKey: run.failedStepKey ?? null,
            finishedAt: (run.finishedAt ?? run.startedAt).toISOString(),
            firstFailure: firstFailure.get(run.id) ?? null,
          }
        : null,
    }));
    return { items, total: rows.length };
  }

  /** The first measurement (plan order) that did not pass, per run. */
  private async firstFailures(em: EntityManager, runIds: number[]): Promise<Map<number, RepairFailureDto>> {
    const out = new Map<number, RepairFailureDto>();
    if (runIds.length === 0) return out;
    const rows = await em.find(
      Measurement,
      { run: { $in: runIds }, verdict: { $ne: MeasurementVerdict.Pass } },
      { orderBy: { stepIndex: 'asc', id: 'asc' } },
    );
    for (const m of rows) {
      if (out.has(m.run.id)) continue;
      out.set(m.run.id, {
        stepKey: m.stepKey,
        stepName: m.stepName,
        quantity: m.quantity,
        name: m.name,
        ...toMeasuredAgainstLimits(m),
        verdict: m.verdict,
      });
    }
    return out;
  }
}
