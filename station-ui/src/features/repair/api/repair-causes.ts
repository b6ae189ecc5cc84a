import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api, apiRequest } from '@/lib/api-client';
import type { RepairCause } from './repair-types';

export const repairCausesQueryKey = ['repair-causes'] as const;

/** `GET /api/repair-causes`: the active causes (for the repair form), or all of them (to maintain the list). */
export function getRepairCauses(all: boolean, signal?: AbortSignal): Promise<RepairCause[]> {
  return api.get<RepairCause[]>(apiPaths.repairCauses, { query: all ? { all: 'true' } : {}, signal });
}

export function useRepairCauses(all = false) {
  return useQuery(queryOptions({ queryKey: [...repairCausesQueryKey, all] as const, queryFn: ({ signal }) => getRepairCauses(all, signal) }));
}

export type CauseChange = { kind: 'add'; name: string } | { kind: 'rename'; id: number; name: string } | { kind: 'switch'; id: number; active: boolean } | { kind: 'delete'; id: number };

/** Add, rename, switch off or on, or delete (never used) a cause: one mutation for the small list editor. */
export function changeRepairCause(change: CauseChange): Promise<unknown> {
  switch (change.kind) {
    case 'add':
      return api.post(apiPaths.repairCauses, { name: change.name });
    case 'rename':
      return api.patch(apiPaths.repairCause(change.id), { name: change.name });
    case 'switch':
      return api.patch(apiPaths.repairCause(change.id), { active: change.active });
    case 'delete':
      return apiRequest(apiPaths.repairCause(change.id), { method: 'DELETE' });
  }
}

export function useChangeRepairCause() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changeRepairCause,
    onSettled: () => queryClient.invalidateQueries({ queryKey: repairCausesQueryKey }),
  });
}
