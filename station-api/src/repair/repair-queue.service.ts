import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable, NotFoundException } from '@nestjs/common';
import type { RepairFailureDto, RepairQueueDto, RepairQueueItemDto, RepairQueueQueryDto } from './dto/repair-queue.dto';
import { queueCte, queueOrder } from './repair-queue-sql';
import type { RepairQueueReason } from './retest-policy';

/** Rows per page when the request does not say (the Repair page shows 25). */
export const QUEUE_PAGE_SIZE = 25;

/**
 * Units waiting for repair under the retest policy (./retest-policy.ts): failed units with no attempts left
 * or sent by the operator, and units in repair; each with its last failing run and that run's first failing
 * measurement. Oldest failure first unless sorted otherwise; filtered, sorted and paged in SQL.
 */
@Injectable()
export class RepairQueueService {
  constructor(private readonly em: EntityManager) {}

  async list(q: RepairQueueQueryDto): Promise<RepairQueueDto> {
    const conn = this.em.getConnection();
    if (q.lotId !== undefined && (await conn.execute<unknown[]>('select 1 from lots where id = ?', [q.lotId])).length === 0) {
      throw new NotFoundException({ message: `There is no lot with id ${q.lotId}.`, details: { code: 'unknown_lot' } });
    }
    if (q.stationId !== undefined && (await conn.execute<unknown[]>('select 1 from stations where id = ?', [q.stationId])).length === 0) {
      throw new NotFoundException({ message: `There is no station with id ${q.stationId}.`, details: { code: 'unknown_station' } });
    }
    const filter = { state: q.state, lotId: q.lotId, stationId: q.stationId, step: q.step, search: q.search };
    const cte = queueCte(filter);
    const limit = q.limit ?? QUEUE_PAGE_SIZE;
    const offset = q.offset ?? 0;
    const rows = await conn.execute<Record<string, unknown>[]>(
      `${cte.sql} select unit_id, serial, state, reason, sent_to_repair_at, test_count, lot_id, lot_code, part_number, run_id, attempt, failed_step_key, failed_at,
         station_id, station_code, station_name from queue${queueOrder(q.sort, q.dir)} limit ? offset ?`,
      [...cte.params, limit, offset],
    );
    const [{ n }] = await conn.execute<{ n: number }[]>(`${cte.sql} select count(*) as n from queue`, cte.params);
    // the steps to filter by: every failed step in the queue as filtered, except by step itself
    const stepCte = queueCte(filter, false);
    const stepRows = await conn.execute<{ key: string; run_id: number }[]>(
      `${stepCte.sql} select failed_step_key as key, min(run_id) as run_id from queue where failed_step_key is not null group by failed_step_key`,
      stepCte.params,
    );
    const stepNames = await this.stepNames(stepRows.map((s) => [Number(s.run_id), s.key]));
    const firstFailure = await this.firstFailures(rows.flatMap((r) => (r.run_id === null ? [] : [Number(r.run_id)])));

    const items: RepairQueueItemDto[] = rows.map((r) => ({
      unitId: Number(r.unit_id),
      serial: String(r.serial),
      state: r.state as 'failed' | 'in_repair',
      reason: r.reason as RepairQueueReason,
      sentToRepairAt: r.sent_to_repair_at === null ? null : toIso(r.sent_to_repair_at),
      testCount: Number(r.test_count),
      lot: { id: Number(r.lot_id), code: String(r.lot_code), partNumber: String(r.part_number) },
      lastFailingRun:
        r.run_id === null
          ? null
          : {
              id: Number(r.run_id),
              station: { id: Number(r.station_id), code: String(r.station_code), name: String(r.station_name) },
              attempt: Number(r.attempt),
              failedStepKey: r.failed_step_key === null ? null : String(r.failed_step_key),
              finishedAt: toIso(r.failed_at),
              firstFailure: firstFailure.get(Number(r.run_id)) ?? null,
            },
    }));
    return { items, total: Number(n), steps: stepRows
        .map((s) => ({ key: s.key, name: stepNames.get(s.key) ?? s.key }))
        .sort((a, b) => a.name.localeCompare(b.name)),
    };
  }

  /** The name of each step key as the run that failed it recorded it. */
  private async stepNames(pairs: [number, string][]): Promise<Map<string, string>> {
    const out = new Map<string, string>();
    if (pairs.length === 0) return out;
    const rows = await this.em.getConnection().execute<{ step_key: string; step_name: string }[]>(
      `select distinct step_key, step_name from measurements where ${pairs.map(() => '(run_id = ? and step_key = ?)').join(' or ')}`,
      pairs.flat(),
    );
    for (const r of rows) out.set(r.step_key, r.step_name);
    return out;
  }

  /** The first measurement (plan order) that did not pass, per run. */
  private async firstFailures(runIds: number[]): Promise<Map<number, RepairFailureDto>> {
    const out = new Map<number, RepairFailureDto>();
    if (runIds.length === 0) return out;
    const rows = await this.em.getConnection().execute<Record<string, unknown>[]>(
      `select run_id, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, guarded_low, guarded_high, verdict from measurements
       where run_id in (${runIds.map(() => '?').join(', ')}) and verdict <> 'pass' order by run_id, step_index, id`,
      runIds,
    );
    const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
    for (const m of rows) {
      const runId = Number(m.run_id);
      if (out.has(runId)) continue;
      out.set(runId, {
        stepKey: String(m.step_key),
        stepName: String(m.step_name),
        quantity: String(m.quantity),
        name: String(m.name),
        value: num(m.value),
        unit: String(m.unit),
        lowLimit: num(m.low_limit),
        highLimit: num(m.high_limit),
        guardedLow: num(m.guarded_low),
        guardedHigh: num(m.guarded_high),
        verdict: m.verdict as RepairFailureDto['verdict'],
      });
    }
    return out;
  }
}

/** A stored date: epoch milliseconds as the ORM writes them (or text from a hand-made row). */
function toIso(v: unknown): string {
  return new Date(typeof v === 'string' && !/^\d+$/.test(v) ? v : Number(v)).toISOString();
}
