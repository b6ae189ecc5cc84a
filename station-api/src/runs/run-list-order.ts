import { RUN_VERDICTS_SORTED, runOrderSql, type RunFilter, type RunSort, runFilterSql } from './run-queries';

/*
 * Which runs are on a page of the runs list, for every sort the list offers, without sorting the whole
 * history (issue 11). Sorting 100,000 joined rows to keep 50 took 400-1,000 ms at a year of history; an
 * index already holds each order, so the page is read from it:
 *  - the list is split into groups that follow one another in the sort order (one verdict, one station, one
 *    attempt number...), each read newest first from an index (group column, started_at) by a seek, and
 *    a group that lies wholly before the page is skipped by its COUNT;
 *  - startedAt reads the started_at index; serial walks the units in serial order (units_serial_nocase) and
 *    each unit's few runs; duration reads an index on the expression (finished_at - started_at).
 * The answer is the same as runOrderSql's full ORDER BY (run-list-order e2e compares them for every sort,
 * both ways, with offsets and filters), which is still used when the filtered list is small: sorting a few
 * thousand narrow rows costs less than walking groups.
 */

/** Up to this many matching runs, the page is sorted in one statement (runOrderSql). */
export const SMALL_LIST = 2000;
/**
 * The same under a filter: a group's seek must then also test the filter on every run of the group, and
 * sorting the filtered runs (one verdict: 8,000 of 100,000) costs less than a walk that may not find them
 * (bench:floor, sorts under a verdict filter).
 */
export const SMALL_FILTERED_LIST = 10_000;

type FilterSql = ReturnType<typeof runFilterSql>;
const NO_FILTER: FilterSql = { where: '', clauses: [], params: [] };

export type SqlExec = (sql: string, params: unknown[]) => Promise<Record<string, unknown>[]>;

/** A stretch of the sort order: the runs matching `where`, read in `order` (which an index delivers). */
export interface RunGroup {
  from?: string;
  where?: string;
  params: unknown[];
  order: string;
}

/** The tables a sort column comes from, joined to test_runs r for the one-statement sort. */
const SORT_JOINS: Record<RunSort, string> = {
  startedAt: '',
  serial: ' join units u on u.id = r.unit_id',
  product: ' join products p on p.id = r.product_id',
  lot: ' join lots l on l.id = r.lot_id',
  station: ' join stations s on s.id = r.station_id',
  fixture: ' join fixtures f on f.id = r.fixture_id',
  operator: ' join users op on op.id = r.operator_id',
  attempt: '',
  plan: ' join plan_versions pv on pv.id = r.plan_version_id join test_plans tp on tp.id = pv.plan_id',
  verdict: '',
  failedStep: '',
  duration: '',
};

const NEWEST = 'r.started_at desc, r.id desc';

/** SQLite's NOCASE collation: ASCII letters folded to lower case, then compared code unit by code unit. */
export function nocaseKey(s: string): string {
  return s.replace(/[A-Z]/g, (c) => c.toLowerCase());
}

function compare(a: string | number, b: string | number): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/**
 * Groups of runs by a small table's rows (stations, lots...), in the order of their sort key; rows whose keys
 * are equal (codes differing only in case) form one group, as they interleave in the full ORDER BY.
 */
function groupsOf(rows: { id: number; key: (string | number)[] }[], column: string, dir: 'asc' | 'desc'): RunGroup[] {
  const sign = dir === 'asc' ? 1 : -1;
  rows.sort((a, b) => {
    for (let i = 0; i < a.key.length; i++) {
      const c = compare(a.key[i], b.key[i]);
      if (c !== 0) return sign * c;
    }
    return 0;
  });
  const groups: RunGroup[] = [];
  let last: string | undefined;
  for (const row of rows) {
    const k = JSON.stringify(row.key);
    if (k === last) {
      const g = groups[groups.length - 1];
      g.params.push(row.id);
      g.where = `${column} in (${g.params.map(() => '?').join(', ')})`;
    } else groups.push({ where: `${column} = ?`, params: [row.id], order: NEWEST });
    last = k;
  }
  return groups;
}

/** The distinct values of an indexed column in index order, one seek each (a skip scan). */
async function distinctValues(exec: SqlExec, column: string, collate = ''): Promise<string[]> {
  const rows = await exec(
    `with recursive v(x) as (select min(${column}${collate}) from test_runs ` +
      `union all select (select min(${column}${collate}) from test_runs where ${column} > v.x${collate}) from v where v.x is not null) ` +
      'select x from v where x is not null',
    [],
  );
  return rows.map((r) => String(r.x));
}

/** The groups whose concatenation is the list in the requested order; undefined: no index walk for it. */
export async function runGroups(exec: SqlExec, sort: RunSort, dir: 'asc' | 'desc', filter: FilterSql = NO_FILTER): Promise<RunGroup[] | undefined> {
  const byDir = <T>(xs: T[]) => (dir === 'asc' ? xs : [...xs].reverse());
  const small = async (sql: string, column: string, params: unknown[] = []) =>
    groupsOf(
      (await exec(sql, params)).map((r) => ({ id: Number(r.id), key: typeof r.k2 === 'number' ? [nocaseKey(String(r.k)), r.k2] : [nocaseKey(String(r.k))] })),
      column,
      dir,
    );
  switch (sort) {
    case 'startedAt':
      // ties (equal start times) stay newest id first, as in runOrderSql
      return [{ params: [], order: `r.started_at ${dir}, r.id desc` }];
    case 'verdict':
      return byDir([...RUN_VERDICTS_SORTED]).map((v) => ({ where: 'r.verdict = ?', params: [v], order: NEWEST }));
    case 'attempt': {
      const [{ top }] = await exec('select max(attempt) as top from test_runs', []);
      const attempts = Array.from({ length: Number(top ?? 0) }, (_, i) => i + 1);
      return byDir(attempts).map((a) => ({ where: 'r.attempt = ?', params: [a], order: NEWEST }));
    }
    case 'failedStep': {
      const keys = byDir(await distinctValues(exec, 'failed_step_key'));
      // runs without a failed step go last either way
      return [
        ...keys.map((k) => ({ where: 'r.failed_step_key = ?', params: [k] as unknown[], order: NEWEST })),
        { where: 'r.failed_step_key is null', params: [], order: NEWEST },
      ];
    }
    case 'operator': {
      // the name stored with the run; a run without one (written before names were stored) is named by its
      // user, which no index on test_runs orders: the one-statement sort is used then
      const [unnamed] = await exec('select 1 as x from test_runs where operator_name is null limit 1', []);
      if (unnamed) return undefined;
      const names = await distinctValues(exec, 'operator_name', ' collate nocase');
      return byDir(names).map((n) => ({ where: 'r.operator_name = ? collate nocase', params: [n], order: NEWEST }));
    }
    case 'station':
      return small('select id, code as k from stations', 'r.station_id');
    case 'lot':
      // a year holds hundreds of lots: under a filter, only the lots its runs belong to (one pass over the
      // filtered runs) rather than a probe for every lot
      return small(
        filter.clauses.length === 0 ? 'select id, code as k from lots' : `select id, code as k from lots where id in (select r.lot_id from test_runs r${filter.where})`,
        'r.lot_id',
        filter.params,
      );
    case 'product':
      return small('select id, part_number as k from products', 'r.product_id');
    case 'fixture':
      return small('select id, code as k from fixtures', 'r.fixture_id');
    case 'plan':
      return small('select pv.id, tp.code as k, pv.version as k2 from plan_versions pv join test_plans tp on tp.id = pv.plan_id', 'r.plan_version_id');
    case 'serial':
      // units in serial order, each unit's runs newest first; CROSS JOIN keeps that order. INDEXED BY: with the
      // LIMIT written into the statement (as the ORM sends it), the planner took the binary unique index and sorted
      // every run (60-150 ms at 100,000 runs, bench:floor)
      return [
        { from: 'units u indexed by units_serial_nocase_index cross join test_runs r on r.unit_id = u.id', params: [], order: `u.serial collate nocase ${dir}, ${NEWEST}` },
      ];
    case 'duration': {
      const d = '(r.finished_at - r.started_at)';
      // INDEXED BY for the same reason as the serial: the planner scanned another index and sorted everything.
      // Under a filter the planner chooses (its index finds the few matching runs, then sorts them)
      const from = filter.clauses.length === 0 ? 'test_runs r indexed by test_runs_duration_index' : undefined;
      // a run still going has no duration: last either way
      return [
        { from, where: `${d} is not null`, params: [], order: `${d} ${dir}, ${NEWEST}` },
        { from, where: `${d} is null`, params: [], order: NEWEST },
      ];
    }
  }
}

/** The SELECT of one group's run ids, with the filter's conditions (the statement the plan check explains). */
export function groupSql(g: RunGroup, filter: FilterSql): { sql: string; count: string; params: unknown[] } {
  const clauses = [...filter.clauses, ...(g.where ? [g.where] : [])];
  const where = clauses.length ? ` where ${clauses.join(' and ')}` : '';
  const from = g.from ?? 'test_runs r';
  return { sql: `select r.id from ${from}${where} order by ${g.order} limit ? offset ?`, count: `select count(*) as n from ${from}${where}`, params: [...filter.params, ...g.params] };
}

/**
 * The ids of one page of the runs list, in list order. `total` is the filtered count (already read for the
 * answer); `smallList` is the size up to which one sorting statement is used instead (tests pass 0).
 */
export async function pageRunIds(
  exec: SqlExec,
  q: RunFilter & { sort?: RunSort; dir?: 'asc' | 'desc'; limit: number; offset: number },
  total: number,
  smallList = SMALL_LIST,
): Promise<number[]> {
  if (q.offset >= total) return [];
  const sort = q.sort ?? 'startedAt';
  const dir = q.dir ?? (sort === 'startedAt' ? 'desc' : 'asc');
  const filter = runFilterSql(q);
  // a serial filter is a scan of the units (LIKE '%part%'); repeating it for every group would cost more than
  // sorting what it finds
  // the serial order walks every unit: under a filter the matching ones may lie anywhere in it (a month's units
  // are far into the order), so the filtered runs are sorted instead
  const small = filter.clauses.length > 0 ? Math.min(smallList * 5, SMALL_FILTERED_LIST) : smallList;
  // newest first (the default) is one statement an index answers under any filter: always read that way
  const walk = sort === 'startedAt' || (total > small && !q.serial && !(sort === 'serial' && filter.clauses.length > 0));
  const groups = walk ? await runGroups(exec, sort, dir, filter) : undefined;
  if (!groups) {
    const rows = await exec(`select r.id from test_runs r${SORT_JOINS[sort]}${filter.where}${runOrderSql(sort, dir)} limit ? offset ?`, [...filter.params, q.limit, q.offset]);
    return rows.map((r) => Number(r.id));
  }
  const ids: number[] = [];
  let skip = q.offset;
  for (const g of groups) {
    const s = groupSql(g, filter);
    const rows = await exec(s.sql, [...s.params, q.limit - ids.length, skip]);
    if (rows.length === 0 && skip > 0) {
      // the whole group lies before the page: skip past it (counted only then; a COUNT of a large group
      // costs more than reading a page of it)
      const [{ n }] = await exec(s.count, s.params);
      skip -= Number(n);
      continue;
    }
    for (const r of rows) ids.push(Number(r.id));
    skip = 0;
    if (ids.length >= q.limit) break;
  }
  return ids;
}
