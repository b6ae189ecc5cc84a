import { useMutation } from '@tanstack/react-query';
import type { RunView } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { Schemas } from '@/lib/api-schema';

export interface StartRunInput {
  stationId: number;
  serial: string;
  /** An engineer's reason to test a unit that already passed */
  overrideReason?: string;
}

/**
 * `POST /api/stations/:id/runs`. Sent only after the operator confirmed the safety prompt, so
 * `safetyConfirmed` is always true here; the run goes on in the background and reports by live events.
 */
export function startRun({ stationId, serial, overrideReason }: StartRunInput): Promise<{ run: RunView }> {
  const body: Schemas['StartRunDto'] = { serial, safetyConfirmed: true, ...(overrideReason ? { overrideReason } : {}) };
  // the answer is read as the live events' RunView (the server's own type), which the screen's run model uses
  return api.post<{ run: RunView }>(apiPaths.stationRuns(stationId), body);
}

export function useStartRun() {
  return useMutation({ mutationFn: startRun });
}
