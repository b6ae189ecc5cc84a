import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type HoldRule } from './types';

/** `PATCH /api/hold-rules/:id` `{ active }`: switches a rule off (or on again). */
export function setHoldRuleActive({ id, active }: { id: number; active: boolean }): Promise<HoldRule> {
  return api.patch<HoldRule>(apiPaths.holdRule(id), { active });
}

export function useSetHoldRuleActive() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setHoldRuleActive,
    onSettled: () => queryClient.invalidateQueries({ queryKey: holdsQueryRoot }),
  });
}
