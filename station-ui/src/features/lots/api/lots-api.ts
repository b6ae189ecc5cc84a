import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiBase, apiPaths } from '@/config/paths';
import { api, ApiError, tokenStore } from '@/lib/api-client';
import type { Lot, LotDetail, LotFileProblem, LotImportResult, LotUnit, NewLot, ProductChoice, ReleaseCheck } from './types';

export const lotsQuery = () => queryOptions({ queryKey: ['lots'] as const, queryFn: ({ signal }) => api.get<Lot[]>(apiPaths.lots, { signal }) });
export const lotQuery = (id: number) => queryOptions({ queryKey: ['lots', id] as const, queryFn: ({ signal }) => api.get<LotDetail>(apiPaths.lot(id), { signal }) });
export const lotUnitsQuery = (id: number) =>
  queryOptions({ queryKey: ['lots', id, 'units'] as const, queryFn: ({ signal }) => api.get<LotUnit[]>(apiPaths.lotUnits(id), { signal }) });
export const releaseCheckQuery = (id: number) =>
  queryOptions({ queryKey: ['lots', id, 'release-check'] as const, queryFn: ({ signal }) => api.get<ReleaseCheck>(apiPaths.lotReleaseCheck(id), { signal }), staleTime: 0 });
export const productsQuery = () =>
  queryOptions({ queryKey: ['products'] as const, queryFn: ({ signal }) => api.get<ProductChoice[]>(apiPaths.products, { signal }), staleTime: 60_000 });

export const useLots = () => useQuery(lotsQuery());
export const useLot = (id: number | null) => useQuery({ ...lotQuery(id ?? 0), enabled: id !== null });
export const useLotUnits = (id: number | null) => useQuery({ ...lotUnitsQuery(id ?? 0), enabled: id !== null });
export const useReleaseCheck = (id: number | null, enabled: boolean) => useQuery({ ...releaseCheckQuery(id ?? 0), enabled: id !== null && enabled });
export const useProducts = () => useQuery(productsQuery());

/** The request body of POST /lots for the chosen way of giving serials. */
export function createLotBody(l: NewLot): Record<string, unknown> {
  const base = { code: l.code.trim(), productId: l.productId, plannedQuantity: l.plannedQuantity };
  if (l.serials.kind === 'range') return { ...base, firstSerial: l.serials.firstSerial.trim(), lastSerial: l.serials.lastSerial.trim() };
  if (l.serials.kind === 'list') return { ...base, serials: l.serials.serials };
  return base;
}

/** Every change to a lot refreshes the list and that lot. */
function useLotMutation<A>(fn: (args: A) => Promise<LotDetail>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (lot) => {
      qc.setQueryData(lotQuery(lot.id).queryKey, lot);
      void qc.invalidateQueries({ queryKey: ['lots'] });
    },
  });
}

export const useCreateLot = () => useLotMutation((l: NewLot) => api.post<LotDetail>(apiPaths.lots, createLotBody(l)));
export const useReleaseLot = () => useLotMutation((a: { id: number; comment: string }) => api.post<LotDetail>(apiPaths.lotRelease(a.id), a.comment.trim() ? { comment: a.comment.trim() } : {}));
export const useCloseLot = () => useLotMutation((a: { id: number; reason: string }) => api.post<LotDetail>(apiPaths.lotClose(a.id), { reason: a.reason.trim() }));

/** The problems of a refused lot file, from the error the server answered (empty for other errors). */
export function lotFileProblems(e: unknown): LotFileProblem[] {
  if (!(e instanceof ApiError)) return [];
  const d = e.details as { code?: string; problems?: LotFileProblem[] } | undefined;
  return d && d.code === 'lot_file_refused' && Array.isArray(d.problems) ? d.problems : [];
}

async function errorOf(res: Response, fallback: string): Promise<ApiError> {
  try {
    const body = (await res.json()) as { message?: unknown; error?: unknown; details?: unknown };
    if (typeof body.message === 'string' && body.message) return new ApiError(res.status, typeof body.error === 'string' ? body.error : res.statusText, body.message, body.details);
  } catch {
    // not JSON: the plain message below
  }
  return new ApiError(res.status, res.statusText || 'Error', fallback);
}

function authHeaders(): Record<string, string> {
  const token = tokenStore.get();
  return token ? { Authorization: `Bearer ${token}` } : {};
}

/** POST /lots/import as multipart (the shared client sends JSON only). */
export async function importLotFile(file: File): Promise<LotImportResult> {
  const form = new FormData();
  form.append('file', file, file.name);
  let res: Response;
  try {
    res = await fetch(`${apiBase}${apiPaths.lotsImport}`, { method: 'POST', headers: { Accept: 'application/json', ...authHeaders() }, body: form });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached, so the file was not imported.');
  }
  if (!res.ok) throw await errorOf(res, `The file could not be imported (HTTP ${res.status}).`);
  return (await res.json()) as LotImportResult;
}

export const useImportLots = () => {
  const qc = useQueryClient();
  return useMutation({ mutationFn: importLotFile, onSuccess: () => void qc.invalidateQueries({ queryKey: ['lots'] }) });
};

/** A file from the API as a Blob with its name (a plain link would carry no bearer token). */
export async function fetchFile(path: string, fallbackName: string): Promise<{ blob: Blob; fileName: string }> {
  let res: Response;
  try {
    res = await fetch(`${apiBase}${path}`, { headers: authHeaders() });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached, so the file could not be downloaded.');
  }
  if (!res.ok) throw await errorOf(res, `The file could not be downloaded (HTTP ${res.status}).`);
  const fileName = /filename="([^"]+)"/.exec(res.headers.get('Content-Disposition') ?? '')?.[1] ?? fallbackName;
  return { blob: await res.blob(), fileName };
}

/** Hands a downloaded file to the browser as a download. */
export function saveFile({ blob, fileName }: { blob: Blob; fileName: string }): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  window.setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
