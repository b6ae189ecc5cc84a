import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { RepairQueue, RepairQueueQuery } from './repair-types';

export type { RepairFailure, RepairQueue, RepairQueueItem } from './repair-types';

/** Every queue query key starts with this, so one invalidation refreshes every page. */
export const repairQueueQueryKey = ['repair-queue'] as const;

/** `GET /api/repair-queue`: filtered, sorted and paged by the server. */
export function getRepairQueue(query: RepairQueueQuery, signal?: AbortSignal): Promise<RepairQueue> {
  return api.get<RepairQueue>(apiPaths.repairQueue, { query: { ...query }, signal });
}

export const repairQueueQueryOptions = (query: RepairQueueQuery) =>
  queryOptions({
    queryKey: [...repairQueueQueryKey, query] as const,
    queryFn: ({ signal }) => getRepairQueue(query, signal),
    // keep the page on screen while the next loads, so the table does not collapse under the scanner
    placeholderData: keepPreviousData,
    // units fail on the stations while the bench works: look again now and then
    refetchInterval: 30_000,
  });

export function useRepairQueue(query: RepairQueueQuery) {
  return useQuery(repairQueueQueryOptions(query));
}
