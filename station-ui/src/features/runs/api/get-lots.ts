import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** A lot as `GET /api/lots` lists it, newest first (only what the runs filter uses). */
export interface LotChoice {
  id: number;
  code: string;
  state: string;
  product: { id: number; partNumber: string; name: string };
}

export async function getLotChoices(signal?: AbortSignal): Promise<LotChoice[]> {
  const rows = await api.get<LotChoice[]>(apiPaths.lots, { signal });
  return rows.map(({ id, code, state, product }) => ({ id, code, state, product }));
}

export const lotChoicesQueryOptions = () =>
  queryOptions({
    queryKey: ['runs', 'lot-choices'] as const,
    queryFn: ({ signal }) => getLotChoices(signal),
    staleTime: 60_000,
  });

export function useLotChoices() {
  return useQuery(lotChoicesQueryOptions());
}
