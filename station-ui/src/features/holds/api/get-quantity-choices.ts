import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type QuantityChoice } from './types';

/** Quantities of the product's released plan that a Cpk or control-chart rule can watch. */
export function getQuantityChoices(productId: number): Promise<QuantityChoice[]> {
  return api.get<QuantityChoice[]>(apiPaths.holdRuleQuantities, { query: { productId } });
}

export const quantityChoicesQueryOptions = (productId: number) =>
  queryOptions({ queryKey: [...holdsQueryRoot, 'quantities', productId], queryFn: () => getQuantityChoices(productId) });

export function useQuantityChoices(productId: number | null) {
  return useQuery({ ...quantityChoicesQueryOptions(productId ?? 0), enabled: productId !== null });
}
