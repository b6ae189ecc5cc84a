import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';
export type { ParetoBar, ParetoDimension, ParetoView } from '@contract/yield-views';
import type { ParetoDimension, ParetoView } from '@contract/yield-views';

export function getFailurePareto(filters: YieldFilters, by: ParetoDimension, signal?: AbortSignal): Promise<ParetoView> {
  return api.get<ParetoView>(yieldApiPaths.pareto, { query: { ...yieldQuery(filters), by }, signal });
}

export const failureParetoQueryOptions = (filters: YieldFilters, by: ParetoDimension) =>
  queryOptions({
    queryKey: [...yieldQueryRoot, 'pareto', filters, by] as const,
    queryFn: ({ signal }) => getFailurePareto(filters, by, signal),
    placeholderData: keepPreviousData,
  });

export function useFailurePareto(filters: YieldFilters, by: ParetoDimension) {
  return useQuery(failureParetoQueryOptions(filters, by));
}
