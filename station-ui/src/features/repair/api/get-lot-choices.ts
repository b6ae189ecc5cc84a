import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

export interface LotChoice {
  id: number;
  code: string;
}

/** The lots to filter the queue by (`GET /api/lots`; only id and code are read). */
export function useLotChoices() {
  return useQuery(
    queryOptions({
      queryKey: ['repair', 'lot-choices'] as const,
      queryFn: ({ signal }) => api.get<LotChoice[]>(apiPaths.lots, { signal }),
      select: (d) => d.map((l) => ({ id: l.id, code: l.code })),
      staleTime: 60_000,
    }),
  );
}
