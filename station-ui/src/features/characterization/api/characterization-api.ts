import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiBase, apiPaths } from '@/config/paths';
import { api, ApiError, tokenStore } from '@/lib/api-client';
import type { AcceptRequest, AcceptResult, Analysis, DataSetSummary, FileProblem, PlanChoice, PlanWithVersions, VersionWithSteps } from './types';

/* The characterization endpoints this feature calls, and the plan reads its "Put into draft" form needs. */

const root = ['characterization'] as const;

export const dataSetsQuery = () =>
  queryOptions({ queryKey: [...root, 'data-sets'] as const, queryFn: ({ signal }) => api.get<DataSetSummary[]>(apiPaths.characterizationDataSets, { signal }) });

export interface AnalysisParams {
  column: string;
  low?: number;
  high?: number;
  /** the suggestion's half-width multiplier (limits at mean ± k·s) */
  k?: number;
  /** expanded uncertainty U (k = 2) the suggestion is guarded by, unit of the column */
  uncertainty?: number;
}

/** The key holds every parameter, k and U among them, so a changed setting is a new question to the server. */
export const analysisQuery = (id: number | null, p: AnalysisParams | null) =>
  queryOptions({
    queryKey: [...root, 'analysis', id, p] as const,
    queryFn: ({ signal }) =>
      api.get<Analysis>(apiPaths.characterizationAnalysis(id!), { query: { column: p!.column, low: p!.low, high: p!.high, k: p!.k, uncertainty: p!.uncertainty }, signal }),
    enabled: id !== null && p !== null,
    placeholderData: keepPreviousData,
  });

export const useDataSets = () => useQuery(dataSetsQuery());
export const useAnalysis = (id: number | null, p: AnalysisParams | null) => useQuery(analysisQuery(id, p));

export const usePlanChoices = () =>
  useQuery({ queryKey: ['plans'] as const, queryFn: ({ signal }) => api.get<PlanChoice[]>(apiPaths.plans, { signal }) });
export const usePlanVersions = (planId: number | null) =>
  useQuery({ queryKey: ['plans', planId] as const, queryFn: ({ signal }) => api.get<PlanWithVersions>(apiPaths.plan(planId!), { signal }), enabled: planId !== null });
export const useVersionSteps = (versionId: number | null) =>
  useQuery({
    queryKey: ['plan-versions', versionId] as const,
    queryFn: ({ signal }) => api.get<VersionWithSteps>(apiPaths.planVersion(versionId!), { signal }),
    enabled: versionId !== null,
  });

/** The problems of a refused upload (`details.problems`), empty for other errors. */
export function fileProblems(error: unknown): FileProblem[] {
  if (!(error instanceof ApiError)) return [];
  const d = error.details as { problems?: unknown } | undefined;
  return d && typeof d === 'object' && Array.isArray(d.problems) ? (d.problems as FileProblem[]) : [];
}

/**
 * Sends the CSV as multipart/form-data (the JSON client cannot). Errors come back as {@link ApiError} with the
 * server's message and `details.problems`, like every other call.
 */
export async function uploadDataSet(input: { file: File; name: string; product?: string | null }): Promise<DataSetSummary> {
  const form = new FormData();
  form.append('name', input.name);
  if (input.product) form.append('product', input.product);
  form.append('file', input.file, input.file.name);
  const headers: Record<string, string> = { Accept: 'application/json' };
  const token = tokenStore.get();
  if (token) headers.Authorization = `Bearer ${token}`;
  let res: Response;
  try {
    res = await fetch(`${apiBase}${apiPaths.characterizationDataSets}`, { method: 'POST', headers, body: form });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached. Check the network connection and try again.');
  }
  const text = await res.text().catch(() => '');
  let body: unknown;
  try {
    body = text ? JSON.parse(text) : undefined;
  } catch {
    body = undefined;
  }
  if (!res.ok) {
    const b = (body ?? {}) as { error?: string; message?: string; details?: unknown };
    throw new ApiError(res.status, b.error ?? res.statusText, b.message ?? `The station server refused the file (HTTP ${res.status}).`, b.details);
  }
  return body as DataSetSummary;
}

export function useUpload() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: uploadDataSet, onSuccess: () => void qc.invalidateQueries({ queryKey: [...root, 'data-sets'] }) });
}

export function useAccept() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ dataSetId, body }: { dataSetId: number; body: AcceptRequest }) => api.post<AcceptResult>(apiPaths.characterizationAccept(dataSetId), body),
    onSuccess: (r) => {
      void qc.invalidateQueries({ queryKey: ['plan-versions', r.planVersionId] });
      void qc.invalidateQueries({ queryKey: ['plans'] });
    },
  });
}
