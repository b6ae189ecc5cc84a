import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { RepairFailureDto, RepairQueueDto, RepairQueueItemDto } from '@/lib/api-schema';

/** The first measurement of the last failing run that did not pass (the server's RepairFailureDto). */
export type RepairFailure = RepairFailureDto;

/** One unit in `GET /api/repair-queue`: failed (waiting) or in repair (received on the bench). */
export type RepairQueueItem = RepairQueueItemDto;

export type RepairQueue = RepairQueueDto;

export const repairQueueQueryKey = ['repair-queue'] as const;

export function getRepairQueue(): Promise<RepairQueue> {
  return api.get<RepairQueue>(apiPaths.repairQueue);
}

export const repairQueueQueryOptions = () =>
  queryOptions({
    queryKey: repairQueueQueryKey,
    queryFn: getRepairQueue,
    // units fail on the stations while the bench works: look again now and then
    refetchInterval: 30_000,
  });

export function useRepairQueue() {
  return useQuery(repairQueueQueryOptions());
}
