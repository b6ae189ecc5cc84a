/*
 * The repair queue as one hand-written SQL query (no entity hydration): only the columns the queue answer
 * shows, filtered, sorted and paged in the database, so the page stays fast with 100,000 runs stored.
 */

/** Plan attempts per unit when no failing run (with its plan version) is stored, e.g. a state set by hand. */
export const DEFAULT_MAX_ATTEMPTS = 3;

/** Columns the queue may be sorted by, each mapped to its SQL (never string-built from the request). */
export const QUEUE_SORTS = {
  failedAt: 'failed_at',
  serial: 'serial',
  state: 'state',
  lot: 'lot_code',
  station: 'station_code',
  step: 'failed_step_key',
  tests: 'test_count',
} as const;
export type QueueSort = keyof typeof QUEUE_SORTS;

export interface QueueFilter {
  state?: 'failed' | 'in_repair';
  lotId?: number;
  stationId?: number;
  /** failed step key of the last failing run */
  step?: string;
  /** any part of the serial, any case */
  search?: string;
}

/** `%`, `_` and the escape character itself match literally in a serial search. */
function likePattern(part: string): string {
  return `%${part.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/**
 * The queue rows as a CTE named `queue`, one row per waiting unit with its last failing run. `reason` follows
 * the retest policy of ./retest-policy.ts (repairQueueReason), written in SQL so paging happens in the
 * database; test/repair-records.e2e-spec.ts checks the two agree.
 * @param withStepFilter false leaves out the step filter (for the list of steps to choose from)
 */
export function queueCte(f: QueueFilter, withStepFilter = true): { sql: string; params: unknown[] } {
  const unitWhere: string[] = ["u.state in ('failed', 'in_repair')"];
  const params: unknown[] = [];
  if (f.state) {
    unitWhere.push('u.state = ?');
    params.push(f.state);
  }
  if (f.lotId) {
    unitWhere.push('u.lot_id = ?');
    params.push(f.lotId);
  }
  // LIKE is case-insensitive for ASCII in SQLite, which is every character a serial may hold
  if (f.search) {
    unitWhere.push("u.serial like ? escape '\\'");
    params.push(likePattern(f.search));
  }
  const rowWhere: string[] = ['reason is not null'];
  if (f.stationId) {
    rowWhere.push('station_id = ?');
    params.push(f.stationId);
  }
  if (withStepFilter && f.step) {
    rowWhere.push('failed_step_key = ?');
    params.push(f.step);
  }
  const sql = `with waiting as (
  select u.id as unit_id, u.serial, u.state, u.sent_to_repair_at, u.test_count, u.test_count_at_return, u.lot_id, l.code as lot_code, p.part_number,
    (select r.id from test_runs r where r.unit_id = u.id and r.verdict = 'fail' order by r.finished_at desc, r.id desc limit 1) as run_id
  from units u join lots l on l.id = u.lot_id join products p on p.id = u.product_id
  where ${unitWhere.join(' and ')}
),
judged as (
  select w.*, r.attempt, r.failed_step_key, coalesce(r.finished_at, r.started_at) as failed_at, r.station_id, s.code as station_code, s.name as station_name,
    case
      when w.state = 'in_repair' then 'in_repair'
      when w.test_count - w.test_count_at_return >= coalesce(pv.max_attempts, ${DEFAULT_MAX_ATTEMPTS}) then 'no_attempts_left'
      when w.sent_to_repair_at is not null then 'sent_by_operator'
    end as reason
  from waiting w left join test_runs r on r.id = w.run_id left join stations s on s.id = r.station_id left join plan_versions pv on pv.id = r.plan_version_id
),
queue as (select * from judged where ${rowWhere.join(' and ')})`;
  return { sql, params };
}

/** ORDER BY for a whitelisted column; ties by failure time, then unit id, so pages never overlap. */
export function queueOrder(sort: QueueSort = 'failedAt', dir: 'asc' | 'desc' = 'asc'): string {
  const col = QUEUE_SORTS[sort];
  // a unit with no stored failing run (state set by hand) goes last whichever way the list is sorted
  const nulls = `case when ${col} is null then 1 else 0 end`;
  const tie = sort === 'failedAt' ? 'unit_id' : `case when failed_at is null then 1 else 0 end, failed_at, unit_id`;
  const collate = sort === 'serial' || sort === 'lot' || sort === 'station' || sort === 'step' ? ' collate nocase' : '';
  return ` order by ${nulls}, ${col}${collate} ${dir}, ${tie}`;
}
