import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

import type { RunDetail } from './run-types';

export type { RunDetail } from './run-types';

export function getRun(runId: number, signal?: AbortSignal): Promise<RunDetail> {
  return api.get<RunDetail>(apiPaths.run(runId), { signal });
}

export const runQueryOptions = (runId: number) =>
  queryOptions({
    queryKey: ['runs', 'detail', runId] as const,
    queryFn: ({ signal }) => getRun(runId, signal),
    // A run still testing changes; a finished one never does (measurements are never altered).
    refetchInterval: (q) => (q.state.data?.verdict === 'running' ? 2_000 : false),
  });

export function useRun(runId: number) {
  return useQuery(runQueryOptions(runId));
}
