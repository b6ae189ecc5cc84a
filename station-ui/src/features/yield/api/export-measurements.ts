import { apiBase } from '@/config/paths';
import { ApiError, tokenStore } from '@/lib/api-client';
import { yieldApiPaths, yieldQuery, type YieldFilters } from './yield-filters';

export interface ExportScope {
  step?: string;
  quantity?: string;
  only?: 'all' | 'failing';
}

/**
 * `GET /api/yield/measurements.csv` as a Blob (RFC 4180 CSV). The shared client reads JSON only, so this fetch is
 * done by hand with the same bearer token and error shape.
 */
export async function exportMeasurements(filters: YieldFilters, scope: ExportScope = {}): Promise<{ blob: Blob; fileName: string }> {
  const params = new URLSearchParams({ ...yieldQuery(filters), ...Object.fromEntries(Object.entries(scope).filter(([, v]) => v)) });
  const token = tokenStore.get();
  let res: Response;
  try {
    res = await fetch(`${apiBase}${yieldApiPaths.measurementsCsv}?${params.toString()}`, {
      headers: { Accept: 'text/csv', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached, so the measurements could not be exported.');
  }
  if (!res.ok) {
    let message = `The export could not be made (HTTP ${res.status}).`;
    try {
      const body = (await res.json()) as { message?: unknown };
      if (typeof body.message === 'string' && body.message) message = body.message;
    } catch {
      // not JSON: keep the plain message
    }
    throw new ApiError(res.status, res.statusText || 'Error', message);
  }
  const disposition = res.headers.get('Content-Disposition') ?? '';
  const fileName = /filename="([^"]+)"/.exec(disposition)?.[1] ?? 'railwright-measurements.csv';
  return { blob: await res.blob(), fileName };
}
