import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { RepairActionDto, RepairResultDto } from '@/lib/api-schema';
import { repairQueueQueryKey } from './get-repair-queue';

export type RepairAction = RepairActionDto['action'];

/** The action and its note (3–500 characters; kept as the reason in the audit trail). */
export type RepairInput = RepairActionDto & { serial: string };

/** `POST /api/units/:serial/repair` → the step taken and the unit as it is now. */
export type RepairResult = RepairResultDto;

export function repairUnit({ serial, action, note }: RepairInput): Promise<RepairResult> {
  return api.post<RepairResult>(apiPaths.unitRepair(serial), { action, note });
}

export function useRepairUnit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: repairUnit,
    // refused or not, the queue may have moved on (another technician): read it again
    onSettled: () => queryClient.invalidateQueries({ queryKey: repairQueueQueryKey }),
  });
}
