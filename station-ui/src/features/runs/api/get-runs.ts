import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ApiQuery, ApiRunVerdict } from '@/lib/api-schema';
import type { RunRow, RunSortColumn } from './run-types';

/** The filters `GET /api/runs` accepts (generated from the server's query DTO); the screen always pages. */
export type RunsQuery = ApiQuery<'RunsController_list'> & { limit: number; offset: number; sort?: RunSortColumn; dir?: 'asc' | 'desc' };

export const RUN_VERDICT_FILTERS = ['pass', 'fail', 'error', 'aborted', 'running'] as const satisfies readonly ApiRunVerdict[];
export type RunVerdictFilter = (typeof RUN_VERDICT_FILTERS)[number];

export interface RunsPage {
  items: RunRow[];
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
