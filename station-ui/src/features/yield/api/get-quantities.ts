import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths, yieldQueryRoot } from './yield-filters';
export type { QuantityChoice } from '@contract/yield-views';
import type { QuantityChoice } from '@contract/yield-views';

/** `GET /api/yield/quantities`: what a product's (or lot's) runs measure, in plan order. */
export function getQuantities(scope: { productId?: string; lotId?: string }, signal?: AbortSignal): Promise<QuantityChoice[]> {
  return api.get<QuantityChoice[]>(yieldApiPaths.quantities, { query: scope, signal });
}

export const quantitiesQueryOptions = (scope: { productId?: string; lotId?: string }) =>
  queryOptions({
    queryKey: [...yieldQueryRoot, 'quantities', scope] as const,
    queryFn: ({ signal }) => getQuantities(scope, signal),
    enabled: Boolean(scope.productId || scope.lotId),
    staleTime: 5 * 60_000,
  });

export function useQuantities(scope: { productId?: string; lotId?: string }) {
  return useQuery(quantitiesQueryOptions(scope));
}
