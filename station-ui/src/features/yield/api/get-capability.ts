import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths, yieldQuery, yieldQueryRoot, type YieldFilters } from './yield-filters';

export interface IndexEstimate {
  value: number;
  lower: number;
  upper: number;
  confidence: number;
  method: string;
}

export interface PpmOutside {
  below: number;
  above: number;
  total: number;
}

/** As station-api/src/stats/capability.ts reports it. */
export interface CapabilityReport {
  n: number;
  mean: number;
  sigmaWithin: number;
  sigmaOverall: number;
  cp: IndexEstimate | null;
  cpk: IndexEstimate;
  pp: IndexEstimate | null;
  ppk: IndexEstimate;
  ppmWithin: PpmOutside;
  ppmOverall: PpmOutside;
}

export interface QuantityLimits {
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
}

/** `GET /api/yield/capability` */
export interface CapabilityView {
  step: string;
  quantity: string;
  name: string;
  stepName: string;
  unit: string;
  n: number;
  limits: QuantityLimits;
  limitSets: number;
  histogram: { edges: number[]; counts: number[]; binWidth: number; rule: string } | null;
  capability: CapabilityReport | null;
  normalityPValue: number | null;
  problem: string | null;
}

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
