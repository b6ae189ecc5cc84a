import { useMutation } from '@tanstack/react-query';
import type { UnitView } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/**
 * `POST /api/units/:serial/send-to-repair` (body `{ note? }`, answers the unit): the operator gives up on
 * retests and puts a failed unit on the repair queue.
 */
export function sendToRepair({ serial, note }: { serial: string; note?: string }): Promise<UnitView> {
  return api.post<UnitView>(apiPaths.unitSendToRepair(serial), note ? { note } : {});
}

export function useSendToRepair() {
  return useMutation({ mutationFn: sendToRepair });
}
