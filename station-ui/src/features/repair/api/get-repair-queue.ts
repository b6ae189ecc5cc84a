import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** The first measurement of the last failing run that did not pass (station-api floor.dto.ts RepairFailureDto). */
export interface RepairFailure {
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  value: number | null;
  unit: string;
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
  verdict: string;
}

/** One unit in `GET /api/repair-queue`: failed (waiting) or in repair (received on the bench). */
export interface RepairQueueItem {
  unitId: number;
  serial: string;
  state: 'failed' | 'in_repair';
  testCount: number;
  lot: { id: number; code: string; partNumber: string };
  lastFailingRun: {
    id: number;
    station: { id: number; code: string; name: string };
    attempt: number;
    failedStepKey: string | null;
    /** ISO 8601 */
    finishedAt: string;
    firstFailure: RepairFailure | null;
  } | null;
}

export interface RepairQueue {
  items: RepairQueueItem[];
  total: number;
}

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
