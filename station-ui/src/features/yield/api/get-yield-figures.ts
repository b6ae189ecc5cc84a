import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';
export { BREAKDOWN_DIMENSIONS } from '@contract/yield-views';
export type { BreakdownDimension, RtyStep, YieldFiguresView, YieldGroup } from '@contract/yield-views';
import type { BreakdownDimension, YieldFiguresView } from '@contract/yield-views';

export function getYieldFigures(filters: YieldFilters, by: BreakdownDimension, signal?: AbortSignal): Promise<YieldFiguresView> {
  return api.get<YieldFiguresView>(yieldApiPaths.figures, { query: { ...yieldQuery(filters), by }, signal });
}

export const yieldFiguresQueryOptions = (filters: YieldFilters, by: BreakdownDimension) =>
  queryOptions({
    queryKey: [...yieldQueryRoot, 'figures', filters, by] as const,
    queryFn: ({ signal }) => getYieldFigures(filters, by, signal),
    placeholderData: keepPreviousData,
  });

export function useYieldFigures(filters: YieldFilters, by: BreakdownDimension) {
  return useQuery(yieldFiguresQueryOptions(filters, by));
}
