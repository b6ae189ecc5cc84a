import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuantitySelection } from './get-capability';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';

export type RuleSet = 'western-electric' | 'nelson';

export interface ChartPoint {
  index: number;
  value: number;
  label: string;
  runIds: number[];
}

export interface ChartPanel {
  centre: number;
  upper: number;
  lower: number;
  points: ChartPoint[];
}

export interface RuleViolation {
  rule: string;
  index: number;
  indices: number[];
  message: string;
}

/** `GET /api/yield/control-chart` */
export interface ControlChartView {
  step: string;
  quantity: string;
  name: string;
  unit: string;
  kind: 'individuals-moving-range' | 'xbar-r' | null;
  subgroupSize: number;
  rules: RuleSet;
  n: number;
  location: ChartPanel | null;
  spread: (ChartPanel & { signals: { index: number; message: string }[] }) | null;
  violations: RuleViolation[];
  problem: string | null;
}

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
