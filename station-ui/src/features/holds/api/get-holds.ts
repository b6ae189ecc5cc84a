import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type Hold } from './types';

export type HoldState = 'active' | 'lifted' | 'all';

export function getHolds(state: HoldState): Promise<Hold[]> {
  return api.get<Hold[]>(apiPaths.holds, { query: { state } });
}

export const holdsQueryOptions = (state: HoldState) => queryOptions({ queryKey: [...holdsQueryRoot, 'holds', state], queryFn: () => getHolds(state) });

export function useHolds(state: HoldState) {
  return useQuery(holdsQueryOptions(state));
}
