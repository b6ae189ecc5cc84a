import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ApiAnswer } from '@/lib/api-schema';

/**
 * How many attempts a plan version allows. The scan answer carries it (and seeds this cache); after a
 * page reload the run on screen only names its plan version, so it is asked from
 * `GET /api/plan-versions/:id`.
 */
export const planAttemptsQueryKey = (planVersionId: number) => ['plan-versions', planVersionId, 'max-attempts'] as const;

export async function getPlanMaxAttempts(planVersionId: number): Promise<number> {
  const v = await api.get<ApiAnswer<'PlansController_getVersion'>>(apiPaths.planVersion(planVersionId));
  return v.maxAttempts;
}

export function usePlanMaxAttempts(planVersionId: number | undefined) {
  return useQuery(
    queryOptions({
      queryKey: planAttemptsQueryKey(planVersionId ?? 0),
      queryFn: () => getPlanMaxAttempts(planVersionId!),
      enabled: planVersionId !== undefined,
      staleTime: Infinity,
      retry: false,
    }),
  );
}
