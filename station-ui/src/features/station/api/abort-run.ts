import { useMutation } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ApiAnswer } from '@/lib/api-schema';

export type AbortResult = ApiAnswer<'RunsController_abort'>;

/** `POST /api/runs/:id/abort`: answers once the fixture is safe (load off, source off) and the run is stored. */
export function abortRun(runId: number): Promise<AbortResult> {
  return api.post<AbortResult>(apiPaths.runAbort(runId));
}

export function useAbortRun() {
  return useMutation({ mutationFn: abortRun });
}
