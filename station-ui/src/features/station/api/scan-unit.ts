import { useMutation } from '@tanstack/react-query';
import type { StepOutline, UnitView } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** `POST /api/stations/:id/scan` → what the server checked and found; nothing is powered. */
export interface ScanResult {
  unit: UnitView;
  lot: { id: number; code: string; state: string };
  product: { id: number; partNumber: string; name: string; vinNomV: number; voutNomV: number; ioutRatedA: number };
  /** The attempt this run would be (1 = first test) */
  attempt: number;
  plan: {
    versionId: number;
    code: string;
    name: string;
    version: number;
    stopAtFirstFailure: boolean;
    maxAttempts: number;
    steps: StepOutline[];
  };
}

export interface ScanInput {
  stationId: number;
  serial: string;
}

export function scanUnit({ stationId, serial }: ScanInput): Promise<ScanResult> {
  return api.post<ScanResult>(apiPaths.stationScan(stationId), { serial });
}

export function useScanUnit() {
  return useMutation({ mutationFn: scanUnit });
}
