import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ParetoDimension } from './get-failure-pareto';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';

export interface ParetoUnit {
  serial: string;
  runId: number;
  attempt: number;
  startedAt: string;
  stepName: string;
  quantity: string;
  quantityName: string;
  value: number | null;
  unit: string;
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
  verdict: 'fail' | 'guard_fail';
}

/** `GET /api/yield/pareto/units` */
export interface ParetoUnitsView {
  key: string;
  label: string;
  units: ParetoUnit[];
  total: number;
  limit: number;
}

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
