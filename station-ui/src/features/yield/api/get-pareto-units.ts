import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ParetoDimension } from './get-failure-pareto';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';
export type { ParetoUnit, ParetoUnitsView } from '@contract/yield-views';
import type { ParetoUnitsView } from '@contract/yield-views';

export function getParetoUnits(filters: YieldFilters, by: ParetoDimension, key: string, signal?: AbortSignal): Promise<ParetoUnitsView> {
  return api.get<ParetoUnitsView>(yieldApiPaths.paretoUnits, { query: { ...yieldQuery(filters), by, key }, signal });
}

export const paretoUnitsQueryOptions = (filters: YieldFilters, by: ParetoDimension, key: string | null) =>
  queryOptions({
    queryKey: [...yieldQueryRoot, 'pareto-units', filters, by, key] as const,
    queryFn: ({ signal }) => getParetoUnits(filters, by, key ?? '', signal),
    enabled: key !== null,
  });

export function useParetoUnits(filters: YieldFilters, by: ParetoDimension, key: string | null) {
  return useQuery(paretoUnitsQueryOptions(filters, by, key));
}
