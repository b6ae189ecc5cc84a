import { useMutation } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ApiAnswer, Schemas } from '@/lib/api-schema';

/** `POST /api/stations/:id/scan` → what the server checked and found; nothing is powered. */
export type ScanResult = ApiAnswer<'StationRunsController_scan'>;

export interface ScanInput {
  stationId: number;
  serial: string;
}

export function scanUnit({ stationId, serial }: ScanInput): Promise<ScanResult> {
  return api.post<ScanResult>(apiPaths.stationScan(stationId), { serial } satisfies Schemas['ScanDto']);
}

export function useScanUnit() {
  return useMutation({ mutationFn: scanUnit });
}
