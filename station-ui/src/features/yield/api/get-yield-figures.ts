import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type ProportionInterval, type YieldFilters } from './yield-filters';

export const BREAKDOWN_DIMENSIONS = ['lot', 'product', 'station', 'fixture', 'operator', 'day', 'shift'] as const;
export type BreakdownDimension = (typeof BREAKDOWN_DIMENSIONS)[number];

export interface YieldGroup {
  key: string;
  label: string;
  unitsTested: number;
  firstPass: ProportionInterval;
  final: ProportionInterval;
}

export interface RtyStep {
  stepKey: string;
  stepName: string;
  entered: number;
  passedFirstTime: number;
  firstPass: ProportionInterval;
}

/** `GET /api/yield/figures` */
export interface YieldFiguresView {
  by: BreakdownDimension;
  overall: YieldGroup;
  rty: { value: number | null; normalizedYield: number | null; steps: RtyStep[]; note: string };
  breakdown: YieldGroup[];
  trend: YieldGroup[];
  definitions: { firstPass: string; final: string; rty: string; interval: string };
}

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
