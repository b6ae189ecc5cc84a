import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type HoldRule } from './types';

export function getHoldRules(productId: number | null): Promise<HoldRule[]> {
  return api.get<HoldRule[]>(apiPaths.holdRules, { query: { productId } });
}

export const holdRulesQueryOptions = (productId: number | null) =>
  queryOptions({ queryKey: [...holdsQueryRoot, 'rules', productId], queryFn: () => getHoldRules(productId) });

export function useHoldRules(productId: number | null) {
  return useQuery(holdRulesQueryOptions(productId));
}
