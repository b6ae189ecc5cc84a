import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';
export type { CapabilityReport, CapabilityView, IndexEstimate, PpmOutside, QuantityLimits } from '@contract/yield-views';
import type { CapabilityView } from '@contract/yield-views';

export interface QuantitySelection {
  step: string;
  quantity: string;
}

export function getCapability(filters: YieldFilters, q: QuantitySelection, signal?: AbortSignal): Promise<CapabilityView> {
  return api.get<CapabilityView>(yieldApiPaths.capability, { query: { ...yieldQuery(filters), ...q }, signal });
}

export const capabilityQueryOptions = (filters: YieldFilters, q: QuantitySelection | null) =>
  queryOptions({
    queryKey: [...yieldQueryRoot, 'capability', filters, q] as const,
    queryFn: ({ signal }) => getCapability(filters, q!, signal),
    enabled: q !== null,
    placeholderData: keepPreviousData,
  });

export function useCapability(filters: YieldFilters, q: QuantitySelection | null) {
  return useQuery(capabilityQueryOptions(filters, q));
}
