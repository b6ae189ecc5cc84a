import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ApiAnswer } from '@/lib/api-schema';

/** `GET /api/stations/:id/status`: the state, why it is not ready, the fixture and the lot it runs. */
export type StationStatus = ApiAnswer<'StationRunsController_status'>;

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
