import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MeasurementView } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** The first measurement of the last failing run that did not pass (station-api floor.dto.ts RepairFailureDto). */
export type RepairFailure = Pick<
  MeasurementView,
  'stepKey' | 'stepName' | 'quantity' | 'name' | 'value' | 'unit' | 'lowLimit' | 'highLimit' | 'guardedLow' | 'guardedHigh' | 'verdict'
>;

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
