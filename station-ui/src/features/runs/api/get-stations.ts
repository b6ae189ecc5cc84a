import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** A station as `GET /api/stations` lists it (only what the runs filter uses). */
export interface StationChoice {
  id: number;
  code: string;
  name: string;
}

export async function getStationChoices(signal?: AbortSignal): Promise<StationChoice[]> {
  const rows = await api.get<StationChoice[]>(apiPaths.stations, { signal });
  return rows
    .map(({ id, code, name }) => ({ id, code, name }))
    .sort((a, b) => a.code.localeCompare(b.code, undefined, { numeric: true }));
}

export const stationChoicesQueryOptions = () =>
  queryOptions({
    queryKey: ['runs', 'station-choices'] as const,
    queryFn: ({ signal }) => getStationChoices(signal),
    staleTime: 60_000,
  });

export function useStationChoices() {
  return useQuery(stationChoicesQueryOptions());
}
