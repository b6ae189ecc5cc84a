import { useMutation } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

export interface AbortResult {
  runId: number;
  verdict: string;
  errorMessage?: string;
}

/** `POST /api/runs/:id/abort`: answers once the fixture is safe (load off, source off) and the run is stored. */
export function abortRun(runId: number): Promise<AbortResult> {
  return api.post<AbortResult>(apiPaths.runAbort(runId));
}

export function useAbortRun() {
  return useMutation({ mutationFn: abortRun });
}
