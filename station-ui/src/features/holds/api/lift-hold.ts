import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type Hold } from './types';

/** `POST /api/holds/:id/lift` with the reason (5–500 characters, kept in the audit trail). */
export function liftHold({ id, reason }: { id: number; reason: string }): Promise<Hold> {
  return api.post<Hold>(apiPaths.holdLift(id), { reason });
}

export function useLiftHold() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: liftHold,
    onSettled: () => queryClient.invalidateQueries({ queryKey: holdsQueryRoot }),
  });
}
