import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { LotDto } from '@/lib/api-schema';

/** A lot as `GET /api/lots` lists it, newest first (only what the runs filter uses). */
export type LotChoice = Pick<LotDto, 'id' | 'code' | 'state' | 'product'>;

export async function getLotChoices(signal?: AbortSignal): Promise<LotChoice[]> {
  const rows = await api.get<LotDto[]>(apiPaths.lots, { signal });
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
