import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { StationDto } from '@/lib/api-schema';

/** A station as `GET /api/stations` lists it (only what the runs filter uses). */
export type StationChoice = Pick<StationDto, 'id' | 'code' | 'name'>;

export async function getStationChoices(signal?: AbortSignal): Promise<StationChoice[]> {
  const rows = await api.get<StationDto[]>(apiPaths.stations, { signal });
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
