import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StationState } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** `GET /api/stations/:id/status`: the state, why it is not ready, the fixture and the lot it runs. */
export interface StationStatus {
  stationId: number;
  stationCode: string;
  stationName: string;
  state: StationState;
  /** Why the station cannot test, in plain words; empty when ready or testing */
  reasons: string[];
  currentRunId?: number;
  currentSerial?: string;
  fixture: { id: number; code: string; calibrationDueAt: string; contactCyclesUsed: number; contactCyclesAllowed: number } | null;
  activeLot: { id: number; code: string; partNumber: string; state: string } | null;
}

export const stationStatusQueryKey = (stationId: number) => ['stations', stationId, 'status'] as const;

export function getStationStatus(stationId: number): Promise<StationStatus> {
  return api.get<StationStatus>(apiPaths.stationStatus(stationId));
}

export const stationStatusQueryOptions = (stationId: number) =>
  queryOptions({
    queryKey: stationStatusQueryKey(stationId),
    queryFn: () => getStationStatus(stationId),
    // `station:state` events keep it current; a refetch happens after a lost live link
    staleTime: Infinity,
  });

export function useStationStatus(stationId: number) {
  return useQuery(stationStatusQueryOptions(stationId));
}
