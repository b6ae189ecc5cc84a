import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { repairQueueQueryKey } from './get-repair-queue';
import { repairParetoQueryKey } from './get-repair-pareto';
import type { RepairAction, RepairResult } from './repair-types';

export type { RepairAction, RepairResult } from './repair-types';

/**
 * One repair step. Receive takes a note; return for retest and scrap write a repair record (symptom, cause,
 * action taken) and may carry a note as a remark.
 */
export interface RepairInput {
  serial: string;
  action: RepairAction;
  note?: string;
  symptom?: string;
  causeId?: number;
  actionTaken?: string;
}

/** `POST /api/units/:serial/repair` → the step taken, the unit as it is now and the record written. */
export function repairUnit({ serial, ...body }: RepairInput): Promise<RepairResult> {
  // fields left empty are not sent: the server refuses record fields on receive rather than dropping them
  const sent = Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined && v !== ''));
  return api.post<RepairResult>(apiPaths.unitRepair(serial), sent);
}

export function useRepairUnit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: repairUnit,
    // refused or not, the queue may have moved on (another technician): read it again
    onSettled: () => {
      void queryClient.invalidateQueries({ queryKey: repairQueueQueryKey });
      void queryClient.invalidateQueries({ queryKey: repairParetoQueryKey });
    },
  });
}
