import { apiBase, apiPaths } from '@/config/paths';
import { ApiError, tokenStore } from '@/lib/api-client';

/**
 * `GET /api/runs/:id/repair-tag.pdf` as a Blob. The shared API client reads JSON only, so this one fetch
 * is done by hand with the same bearer token and the same error shape.
 */
export async function getRepairTag(runId: number, signal?: AbortSignal): Promise<Blob> {
  const token = tokenStore.get();
  let res: Response;
  try {
    res = await fetch(`${apiBase}${apiPaths.runRepairTag(runId)}`, {
      headers: { Accept: 'application/pdf', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
      signal,
    });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached, so the repair tag could not be fetched.');
  }
  if (!res.ok) {
    let message = `The repair tag could not be made (HTTP ${res.status}).`;
    try {
      const body = (await res.json()) as { message?: unknown };
      if (typeof body.message === 'string' && body.message) message = body.message;
    } catch {
      // not JSON: keep the plain message
    }
    throw new ApiError(res.status, res.statusText || 'Error', message);
  }
  const blob = await res.blob();
  if (blob.size === 0) throw new ApiError(res.status, 'Empty', 'The station server sent an empty repair tag.');
  // the browser's viewer needs the PDF type to show it
  return blob.type === 'application/pdf' ? blob : new Blob([blob], { type: 'application/pdf' });
}
