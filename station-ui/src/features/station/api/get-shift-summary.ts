import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ShiftSummary } from '@/lib/shift-summary';

export type { ShiftSummary };

export const shiftSummaryQueryKey = (stationId: number) => ['stations', stationId, 'shift-summary'] as const;

export function getShiftSummary(stationId: number): Promise<ShiftSummary> {
  return api.get<ShiftSummary>(apiPaths.stationShiftSummary(stationId));
}

export const shiftSummaryQueryOptions = (stationId: number) =>
  queryOptions({
    queryKey: shiftSummaryQueryKey(stationId),
    queryFn: () => getShiftSummary(stationId),
    // refreshed on every `run:finished`; the timer only moves units per hour along between units
    staleTime: 60_000,
    refetchInterval: 5 * 60_000,
  });

export function useShiftSummary(stationId: number) {
  return useQuery(shiftSummaryQueryOptions(stationId));
}
