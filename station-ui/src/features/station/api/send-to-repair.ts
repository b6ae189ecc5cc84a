import { useMutation } from '@tanstack/react-query';
import type { UnitView } from '@station-events';
import { api } from '@/lib/api-client';

/**
 * `POST /api/units/:serial/send-to-repair` (body `{ note? }`, answers the unit): the operator gives up on
 * retests and puts a failed unit on the repair queue. The path is written here, not in config/paths.ts,
 * because the station feature may not edit shared files; it can move there at merge.
 */
export const sendToRepairPath = (serial: string) => `/units/${encodeURIComponent(serial)}/send-to-repair`;

export function sendToRepair({ serial, note }: { serial: string; note?: string }): Promise<UnitView> {
  return api.post<UnitView>(sendToRepairPath(serial), note ? { note } : {});
}

export function useSendToRepair() {
  return useMutation({ mutationFn: sendToRepair });
}
