import { EntityManager } from '@mikro-orm/sqlite';
import { Inject, Injectable, NotFoundException } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { EnvironmentVariables } from '../config/env.validation';
import { TestRun } from '../runs/test-run.entity';
import { Station } from '../stations/station.entity';
import type { ShiftSummaryDto } from './dto/shift.dto';
import { parseShiftStarts, ShiftStart, shiftAt, ShiftWindow, summarizeShift } from './shift';

/** Where the shift counters read the time; tests can provide another. */
export const SHIFT_CLOCK = Symbol('SHIFT_CLOCK');
export type ShiftClock = () => Date;

/** The current shift's counters per station (arithmetic in ./shift.ts). */
@Injectable()
export class ShiftSummaryService {
  private readonly starts: ShiftStart[];

  constructor(
    private readonly em: EntityManager,
    config: ConfigService<EnvironmentVariables, true>,
    @Inject(SHIFT_CLOCK) private readonly clock: ShiftClock,
  ) {
    // validated at start-up (env.validation.ts); parsing again here gives the sorted list
    this.starts = parseShiftStarts(config.get('SHIFT_STARTS', { infer: true }));
  }

  /** The shift `at` falls in (default: now). */
  currentShift(at: Date = this.clock()): ShiftWindow {
    return shiftAt(at, this.starts);
  }

  /** Counters of a station for the shift running now; 404 `unknown_station` for an unknown id. */
  async forStation(stationId: number): Promise<ShiftSummaryDto> {
    if ((await this.em.fork().count(Station, { id: stationId })) === 0) {
      throw new NotFoundException({ message: `There is no station with id ${stationId}.`, details: { code: 'unknown_station' } });
    }
    return (await this.forStations([stationId])).get(stationId)!;
  }

  /** Counters of several stations in the shift of `now`, with one query. */
  async forStations(stationIds: number[], now: Date = this.clock()): Promise<Map<number, ShiftSummaryDto>> {
    const window = this.currentShift(now);
    // own fork: these runs are loaded partially and must not sit in a caller's identity map
    const runs = stationIds.length
      ? await this.em.fork().find(
          TestRun,
          { station: { $in: stationIds }, finishedAt: { $gte: window.start, $lt: window.end } },
          { fields: ['unit', 'station', 'attempt', 'verdict', 'finishedAt'] },
        )
      : [];
    const out = new Map<number, ShiftSummaryDto>();
    for (const stationId of stationIds) {
      const own = runs
        .filter((r) => r.station.id === stationId)
        .map((r) => ({ unitId: r.unit.id, attempt: r.attempt, verdict: r.verdict, finishedAt: r.finishedAt ?? null }));
      out.set(stationId, {
        stationId,
        shiftName: window.name,
        shiftStart: window.start.toISOString(),
        shiftEnd: window.end.toISOString(),
        ...summarizeShift(own, window, now),
      });
    }
    return out;
  }
}
