import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuantitySelection } from './get-capability';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';
export type { ChartPanel, ChartPoint, ControlChartView, RuleSet, RuleViolation } from '@contract/yield-views';
import type { ControlChartView, RuleSet } from '@contract/yield-views';

export interface ChartOptions {
  subgroupSize: number;
  rules: RuleSet;
}

export function getControlChart(filters: YieldFilters, q: QuantitySelection, o: ChartOptions, signal?: AbortSignal): Promise<ControlChartView> {
  return api.get<ControlChartView>(yieldApiPaths.controlChart, {
    query: { ...yieldQuery(filters), ...q, subgroupSize: o.subgroupSize, rules: o.rules },
    signal,
  });
}

export const controlChartQueryOptions = (filters: YieldFilters, q: QuantitySelection | null, o: ChartOptions) =>
  queryOptions({
    queryKey: [...yieldQueryRoot, 'control-chart', filters, q, o] as const,
    queryFn: ({ signal }) => getControlChart(filters, q!, o, signal),
    enabled: q !== null,
    placeholderData: keepPreviousData,
  });

export function useControlChart(filters: YieldFilters, q: QuantitySelection | null, o: ChartOptions) {
  return useQuery(controlChartQueryOptions(filters, q, o));
}
