import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { StationDto } from '@/lib/api-schema';

/** A station as `GET /api/stations` lists it. */
export type StationSummary = StationDto;

export const stationsQueryKey = ['stations', 'list'] as const;

export async function getStations(): Promise<StationSummary[]> {
  const rows = await api.get<StationSummary[]>(apiPaths.stations);
  return [...rows].sort((a, b) => a.code.localeCompare(b.code, undefined, { numeric: true }));
}

export const stationsQueryOptions = () => queryOptions({ queryKey: stationsQueryKey, queryFn: getStations });

export function useStations() {
  return useQuery(stationsQueryOptions());
}
