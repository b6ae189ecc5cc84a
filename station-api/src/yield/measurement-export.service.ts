import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import type { ExportQueryDto } from './dto/yield-query.dto';
import { csvRecord } from './csv';
import { ALL_RUN_FILTERS, resolveFilter, runConditions } from './yield-filter';

/** Rows fetched per query: a year of history (about 1.4 M measurements) never sits in memory at once. */
const CHUNK_ROWS = 5_000;

export const EXPORT_COLUMNS = [
  'measurement_id', 'run_id', 'serial', 'lot', 'part_number', 'station', 'fixture', 'operator', 'attempt', 'run_verdict',
  'run_started_at', 'step_key', 'step_name', 'quantity', 'quantity_name', 'value', 'unit', 'low_limit', 'high_limit',
  'guarded_low', 'guarded_high', 'measurement_verdict', 'measured_at',
] as const;

/**
 * The measurements behind the yield views as CSV (RFC 4180, see ./csv.ts), with the same filters. Times are
 * ISO 8601 in UTC. Read in id order, a chunk at a time (keyset paging on measurements.id). The CROSS JOIN makes
 * SQLite walk measurements in id order (its rule for CROSS JOIN: the left table is the outer loop); with a plain
 * join it starts from a filtered test_runs index and sorts the whole selection again for every chunk.
 */
@Injectable()
export class MeasurementExportService {
  constructor(private readonly em: EntityManager) {}

  /** The file name and the CSV text, chunk by chunk; the first chunk is the header record. */
  async *csv(q: ExportQueryDto): AsyncGenerator<string> {
    const f = resolveFilter(q);
    const where = runConditions(f, 'r', ALL_RUN_FILTERS);
    const own: string[] = [];
    const ownParams: unknown[] = [];
    if (q.step) {
      own.push('m.step_key = ?');
      ownParams.push(q.step);
    }
    if (q.quantity) {
      own.push('m.quantity = ?');
      ownParams.push(q.quantity);
    }
    if (q.only === 'failing') own.push(`m.verdict in ('fail', 'guard_fail')`);
    const ownSql = own.map((c) => ` and ${c}`).join('');
    yield csvRecord([...EXPORT_COLUMNS]);
    const conn = this.em.getConnection();
    let after = 0;
    for (;;) {
      const rows = (await conn.execute(
        `select m.id, r.id as run_id, u.serial, l.code as lot, p.part_number, s.code as station, fx.code as fixture,
           us.display_name as operator, r.attempt, r.verdict as run_verdict, r.started_at, m.step_key, m.step_name, m.quantity,
           m.name, m.value, m.unit, m.low_limit, m.high_limit, m.guarded_low, m.guarded_high, m.verdict, m.measured_at
         from measurements m cross join test_runs r on r.id = m.run_id join units u on u.id = r.unit_id join lots l on l.id = r.lot_id
           join products p on p.id = r.product_id join stations s on s.id = r.station_id join fixtures fx on fx.id = r.fixture_id
           join users us on us.id = r.operator_id
         where m.id > ?${where.sql}${ownSql}
         order by m.id limit ${CHUNK_ROWS}`,
        [after, ...where.params, ...ownParams],
      )) as Record<string, string | number | null>[];
      if (rows.length === 0) return;
      let text = '';
      for (const r of rows) {
        text += csvRecord([
          r.id, r.run_id, r.serial, r.lot, r.part_number, r.station, r.fixture, r.operator, r.attempt, r.run_verdict,
          iso(r.started_at), r.step_key, r.step_name, r.quantity, r.name, r.value, r.unit, r.low_limit, r.high_limit,
          r.guarded_low, r.guarded_high, r.verdict, iso(r.measured_at),
        ]);
      }
      yield text;
      after = Number(rows[rows.length - 1].id);
      if (rows.length < CHUNK_ROWS) return;
    }
  }
}

function iso(ms: string | number | null): string {
  return ms === null ? '' : new Date(Number(ms)).toISOString();
}
