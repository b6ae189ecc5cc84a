import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** `GET /api/stations/:id/shift-summary`: this station's counts for the current shift. */
export interface ShiftSummary {
  stationId: number;
  shiftName: string;
  /** ISO 8601 */
  shiftStart: string;
  shiftEnd: string;
  tested: number;
  passed: number;
  failed: number;
  errors: number;
  aborted: number;
  /** First-pass yield in %, null before the first unit of the shift */
  firstPassYieldPct: number | null;
  unitsPerHour: number | null;
}

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
