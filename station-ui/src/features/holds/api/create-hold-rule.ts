import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type HoldRule, type NewHoldRule } from './types';

export function createHoldRule(rule: NewHoldRule): Promise<HoldRule> {
  return api.post<HoldRule>(apiPaths.holdRules, rule);
}

export function useCreateHoldRule() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createHoldRule,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: holdsQueryRoot }),
  });
}
