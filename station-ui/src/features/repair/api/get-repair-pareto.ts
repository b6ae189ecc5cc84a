import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { RepairPareto } from './repair-types';

/** The yield Pareto's filters (YYYY-MM-DD days, ids as text; empty: not filtered). */
export interface RepairParetoFilters {
  from?: string;
  to?: string;
  lotId?: string;
  productId?: string;
}

export const repairParetoQueryKey = ['repair-pareto'] as const;

export function getRepairPareto(filters: RepairParetoFilters, signal?: AbortSignal): Promise<RepairPareto> {
  const query = Object.fromEntries(Object.entries(filters).filter(([, v]) => v));
  return api.get<RepairPareto>(apiPaths.repairPareto, { query, signal });
}

export function useRepairPareto(filters: RepairParetoFilters) {
  return useQuery(queryOptions({ queryKey: [...repairParetoQueryKey, filters] as const, queryFn: ({ signal }) => getRepairPareto(filters, signal) }));
}
