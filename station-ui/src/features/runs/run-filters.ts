import { RUN_VERDICT_FILTERS, type RunsQuery, type RunVerdictFilter } from './api/get-runs';
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

/** Reads filters and page from the address; anything malformed is ignored rather than sent to the server. */
export function runFiltersFromParams(params: URLSearchParams): { filters: RunFilters; page: number } {
  const filters = { ...emptyRunFilters };
  for (const k of FILTER_KEYS) filters[k] = (params.get(k) ?? '').trim();
  const page = Number.parseInt(params.get('page') ?? '1', 10);
  return { filters, page: Number.isFinite(page) && page >= 1 ? page : 1 };
}

/** Writes only the filters that are set, so a shared address stays short. */
export function runParamsFrom(filters: RunFilters, page = 1): URLSearchParams {
  const params = new URLSearchParams();
  for (const k of FILTER_KEYS) if (filters[k].trim()) params.set(k, filters[k].trim());
  if (page > 1) params.set('page', String(page));
  return params;
}

const positiveInt = (v: string): number | undefined => (/^\d+$/.test(v) && Number(v) >= 1 ? Number(v) : undefined);

/** The server query for these filters. `to` is a whole day, so the server's exclusive bound is the next midnight. */
export function runsQueryFrom(filters: RunFilters, page: number): RunsQuery {
  const verdict = (RUN_VERDICT_FILTERS as readonly string[]).includes(filters.verdict) ? (filters.verdict as RunVerdictFilter) : undefined;
  return {
    stationId: positiveInt(filters.station),
    lotId: positiveInt(filters.lot),
    serial: filters.serial.trim() || undefined,
    verdict,
    from: dayStartIso(filters.from),
    to: dayStartIso(filters.to, 1),
    limit: RUNS_PAGE_SIZE,
    offset: (page - 1) * RUNS_PAGE_SIZE,
  };
}
