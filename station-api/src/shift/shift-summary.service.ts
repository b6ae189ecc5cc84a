import { EntityManager } from '@mikro-orm/sqlite';
import { Inject, Injectable, NotFoundException } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { EnvironmentVariables } from '../config/env.validation';
import type { ShiftSummaryDto } from './dto/shift.dto';
import { parseShiftStarts, ShiftRun, ShiftStart, shiftAt, ShiftWindow, summarizeShift } from './shift';

/** Where the shift counters read the time; tests can provide another. */
export const SHIFT_CLOCK = Symbol('SHIFT_CLOCK');
export type ShiftClock = () => Date;

/** The columns of a run the counters use. */
type RunRow = { station_id: number; unit_id: number; attempt: number; verdict: ShiftRun['verdict']; finished_at: number | null };

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
    const now = this.clock();
    const window = this.currentShift(now);
    // one statement: the station row tells an unknown id from a station without runs this shift
    const rows = await this.em
      .getConnection()
      .execute<(RunRow & { known: number })[]>(
        'select s.id as known, r.station_id, r.unit_id, r.attempt, r.verdict, r.finished_at from stations s ' +
          'left join test_runs r on r.station_id = s.id and r.finished_at >= ? and r.finished_at < ? where s.id = ? order by r.id',
        [window.start.getTime(), window.end.getTime(), stationId],
      );
    if (rows.length === 0) {
      throw new NotFoundException({ message: `There is no station with id ${stationId}.`, details: { code: 'unknown_station' } });
    }
    return this.summaries([stationId], rows.filter((r) => r.station_id !== null), window, now).get(stationId)!;
  }

  /**
   * Counters of several stations in the shift of `now`, with one query. Hand-written SQL reading only the
   * five columns the counters use, on the index test_runs(station_id, finished_at): the ORM's partial
   * entities cost ~10x the SQL at a year of history (issue 11, docs/performance.md).
   */
  async forStations(stationIds: number[], now: Date = this.clock()): Promise<Map<number, ShiftSummaryDto>> {
    const window = this.currentShift(now);
    const rows =
      stationIds.length === 0
        ? []
        : await this.em
            .getConnection()
            .execute<RunRow[]>(
              `select station_id, unit_id, attempt, verdict, finished_at from test_runs ` +
                `where station_id in (${stationIds.map(() => '?').join(', ')}) and finished_at >= ? and finished_at < ? order by id`,
              [...stationIds, window.start.getTime(), window.end.getTime()],
            );
    return this.summaries(stationIds, rows, window, now);
  }

  private summaries(stationIds: number[], rows: RunRow[], window: ShiftWindow, now: Date): Map<number, ShiftSummaryDto> {
    const byStation = new Map<number, ShiftRun[]>(stationIds.map((id) => [id, []]));
    for (const r of rows) {
      byStation.get(Number(r.station_id))?.push({
        unitId: Number(r.unit_id),
        attempt: Number(r.attempt),
        verdict: r.verdict,
        finishedAt: r.finished_at === null ? null : new Date(Number(r.finished_at)),
      });
    }
    const out = new Map<number, ShiftSummaryDto>();
    for (const stationId of stationIds) {
      out.set(stationId, {
        stationId,
        shiftName: window.name,
        shiftStart: window.start.toISOString(),
        shiftEnd: window.end.toISOString(),
        ...summarizeShift(byStation.get(stationId)!, window, now),
      });
    }
    return out;
  }
}
