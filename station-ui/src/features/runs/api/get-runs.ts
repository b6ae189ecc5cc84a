import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { RunView } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** The filters `GET /api/runs` accepts (station-api runs/dto/runs.dto.ts RunsQueryDto); it refuses any other field. */
export interface RunsQuery {
  stationId?: number;
  lotId?: number;
  /** Exact serial: the server has no prefix search */
  serial?: string;
  verdict?: RunVerdictFilter;
  /** Runs started at or after, ISO 8601 */
  from?: string;
  /** Runs started before (exclusive), ISO 8601 */
  to?: string;
  limit: number;
  offset: number;
}

export const RUN_VERDICT_FILTERS = ['pass', 'fail', 'error', 'aborted', 'running'] as const;
export type RunVerdictFilter = (typeof RUN_VERDICT_FILTERS)[number];

export interface RunsPage {
  items: RunView[];
  total: number;
}

export function getRuns(query: RunsQuery, signal?: AbortSignal): Promise<RunsPage> {
  return api.get<RunsPage>(apiPaths.runs, { query: { ...query }, signal });
}

export const runsQueryOptions = (query: RunsQuery) =>
  queryOptions({
    queryKey: ['runs', 'list', query] as const,
    queryFn: ({ signal }) => getRuns(query, signal),
    // Keep the last page on screen while the next one loads, so the table does not collapse.
    placeholderData: keepPreviousData,
  });

export function useRuns(query: RunsQuery) {
  return useQuery(runsQueryOptions(query));
}
