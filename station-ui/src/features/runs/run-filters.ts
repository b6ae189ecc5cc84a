import { RUN_VERDICT_FILTERS, type RunsQuery, type RunVerdictFilter } from './api/get-runs';
import { RUN_SORT_COLUMNS, type RunSortColumn } from './api/run-types';
import { dayStartIso } from './format';

export const RUNS_PAGE_SIZE = 50;

/** The runs filters as they stand in the address (`?station=2&verdict=fail&from=2026-03-02&page=2`). */
export interface RunFilters {
  station: string;
  lot: string;
  serial: string;
  verdict: string;
  /** yyyy-mm-dd, local day, inclusive */
  from: string;
  /** yyyy-mm-dd, local day, inclusive */
  to: string;
}

export const emptyRunFilters: RunFilters = { station: '', lot: '', serial: '', verdict: '', from: '', to: '' };

const FILTER_KEYS = Object.keys(emptyRunFilters) as (keyof RunFilters)[];

/** The column the list is sorted by (the server sorts); absent: newest first. */
export interface RunSort {
  sort: RunSortColumn;
  dir: 'asc' | 'desc';
}

/** Newest first, as the server lists without a sort. */
export const defaultRunSort: RunSort = { sort: 'startedAt', dir: 'desc' };

/** Reads filters, page and sort from the address; anything malformed is ignored rather than sent to the server. */
export function runFiltersFromParams(params: URLSearchParams): { filters: RunFilters; page: number; sort: RunSort } {
  const filters = { ...emptyRunFilters };
  for (const k of FILTER_KEYS) filters[k] = (params.get(k) ?? '').trim();
  const page = Number.parseInt(params.get('page') ?? '1', 10);
  const column = params.get('sort') ?? '';
  const dir = params.get('dir');
  const sort: RunSort = (RUN_SORT_COLUMNS as readonly string[]).includes(column)
    ? { sort: column as RunSortColumn, dir: dir === 'asc' || dir === 'desc' ? dir : column === 'startedAt' ? 'desc' : 'asc' }
    : defaultRunSort;
  return { filters, page: Number.isFinite(page) && page >= 1 ? page : 1, sort };
}

/** Writes only the filters that are set (and a sort other than newest first), so a shared address stays short. */
export function runParamsFrom(filters: RunFilters, page = 1, sort: RunSort = defaultRunSort): URLSearchParams {
  const params = new URLSearchParams();
  for (const k of FILTER_KEYS) if (filters[k].trim()) params.set(k, filters[k].trim());
  if (sort.sort !== defaultRunSort.sort || sort.dir !== defaultRunSort.dir) {
    params.set('sort', sort.sort);
    params.set('dir', sort.dir);
  }
  if (page > 1) params.set('page', String(page));
  return params;
}

const positiveInt = (v: string): number | undefined => (/^\d+$/.test(v) && Number(v) >= 1 ? Number(v) : undefined);

/** The server query for these filters. `to` is a whole day, so the server's exclusive bound is the next midnight. */
export function runsQueryFrom(filters: RunFilters, page: number, sort: RunSort = defaultRunSort): RunsQuery {
  const verdict = (RUN_VERDICT_FILTERS as readonly string[]).includes(filters.verdict) ? (filters.verdict as RunVerdictFilter) : undefined;
  return {
    stationId: positiveInt(filters.station),
    lotId: positiveInt(filters.lot),
    serial: filters.serial.trim() || undefined,
    verdict,
    from: dayStartIso(filters.from),
    to: dayStartIso(filters.to, 1),
    ...(sort.sort !== defaultRunSort.sort || sort.dir !== defaultRunSort.dir ? { sort: sort.sort, dir: sort.dir } : {}),
    limit: RUNS_PAGE_SIZE,
    offset: (page - 1) * RUNS_PAGE_SIZE,
  };
}
