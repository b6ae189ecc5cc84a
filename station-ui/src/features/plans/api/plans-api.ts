import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { PlanComparison, PlanDetail, PlanStep, PlanSummary, StepKindDescription, StepsPreview, VersionDetail, WhatIfResult, WhatIfScope } from './types';

/*
 * The plans endpoints this feature calls. Rules (units, bounds, limit keys) come from the server's
 * step-kind registry (GET /plan-step-kinds) and its checks (POST /plans/:id/preview); none are kept here.
 */

export const plansQuery = () => queryOptions({ queryKey: ['plans'] as const, queryFn: ({ signal }) => api.get<PlanSummary[]>(apiPaths.plans, { signal }) });
export const planQuery = (id: number) => queryOptions({ queryKey: ['plans', id] as const, queryFn: ({ signal }) => api.get<PlanDetail>(apiPaths.plan(id), { signal }) });
export const versionQuery = (id: number) =>
  queryOptions({ queryKey: ['plan-versions', id] as const, queryFn: ({ signal }) => api.get<VersionDetail>(apiPaths.planVersion(id), { signal }) });
export const stepKindsQuery = () =>
  queryOptions({ queryKey: ['plan-step-kinds'] as const, queryFn: ({ signal }) => api.get<StepKindDescription[]>(apiPaths.planStepKinds, { signal }), staleTime: Infinity });
export const compareQuery = (from: number, to: number) =>
  queryOptions({ queryKey: ['plan-versions', 'compare', from, to] as const, queryFn: ({ signal }) => api.get<PlanComparison>(apiPaths.planCompare(from, to), { signal }) });

export const usePlans = () => useQuery(plansQuery());
export const usePlan = (id: number | null) => useQuery({ ...planQuery(id ?? 0), enabled: id !== null });
export const useVersion = (id: number | null) => useQuery({ ...versionQuery(id ?? 0), enabled: id !== null });
export const useStepKinds = () => useQuery(stepKindsQuery());
export const useCompare = (from: number | null, to: number | null) => useQuery({ ...compareQuery(from ?? 0, to ?? 0), enabled: from !== null && to !== null });

export function previewSteps(planId: number, steps: PlanStep[], signal?: AbortSignal): Promise<StepsPreview> {
  return api.post<StepsPreview>(apiPaths.planPreview(planId), { steps }, { signal });
}

export function runWhatIf(versionId: number, scope: WhatIfScope): Promise<WhatIfResult> {
  return api.post<WhatIfResult>(apiPaths.planWhatIf(versionId), scope);
}

/** Every change to a version refreshes the plan lists and that version. */
function useVersionMutation<A>(fn: (args: A) => Promise<VersionDetail>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (v) => {
      qc.setQueryData(versionQuery(v.id).queryKey, v);
      void qc.invalidateQueries({ queryKey: ['plans'] });
      void qc.invalidateQueries({ queryKey: ['plan-versions', 'compare'] });
    },
  });
}

export const useSaveDraft = () =>
  useVersionMutation((a: { id: number; steps: PlanStep[]; stopAtFirstFailure: boolean; maxAttempts: number }) =>
    api.patch<VersionDetail>(apiPaths.planVersion(a.id), { steps: a.steps, stopAtFirstFailure: a.stopAtFirstFailure, maxAttempts: a.maxAttempts }),
  );
export const useNewDraft = () => useVersionMutation((a: { fromId: number; reason: string }) => api.post<VersionDetail>(apiPaths.planVersionDrafts(a.fromId), { reason: a.reason }));
export const useSubmit = () => useVersionMutation((a: { id: number; reason: string }) => api.post<VersionDetail>(apiPaths.planVersionSubmit(a.id), { reason: a.reason }));
export const useRelease = () => useVersionMutation((a: { id: number; reason: string }) => api.post<VersionDetail>(apiPaths.planVersionRelease(a.id), { reason: a.reason }));
export const useRetire = () => useVersionMutation((a: { id: number; reason: string }) => api.post<VersionDetail>(apiPaths.planVersionRetire(a.id), { reason: a.reason }));
