import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { repairQueueQueryKey } from './get-repair-queue';

export type RepairAction = 'receive' | 'return' | 'scrap';

export interface RepairInput {
  serial: string;
  action: RepairAction;
  /** What was found or done, 3–500 characters; kept as the reason in the audit trail */
  note: string;
}

/** `POST /api/units/:serial/repair` → the step taken and the unit as it is now. */
export interface RepairResult {
  action: RepairAction;
  fromState: string;
  toState: string;
  auditEventId: number;
  unit: { id: number; serial: string; state: string; testCount: number };
}

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
