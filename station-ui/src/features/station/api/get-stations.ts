import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StationState } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** A station as `GET /api/stations` lists it (the fields this screen uses). */
export interface StationSummary {
  id: number;
  code: string;
  name: string;
  location: string | null;
  active: boolean;
  fixture: { id: number; code: string } | null;
  activeLot: { id: number; code: string; partNumber: string } | null;
  state: StationState;
  reasons: string[];
}

export const stationsQueryKey = ['stations', 'list'] as const;

export async function getStations(): Promise<StationSummary[]> {
  const rows = await api.get<StationSummary[]>(apiPaths.stations);
  return [...rows].sort((a, b) => a.code.localeCompare(b.code, undefined, { numeric: true }));
}

export const stationsQueryOptions = () => queryOptions({ queryKey: stationsQueryKey, queryFn: getStations });

export function useStations() {
  return useQuery(stationsQueryOptions());
}
