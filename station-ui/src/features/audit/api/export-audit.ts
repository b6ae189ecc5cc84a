import { apiBase, apiPaths } from '@/config/paths';
import { ApiError, tokenStore } from '@/lib/api-client';
import type { AuditQuery } from './audit-types';

/**
 * `GET /api/audit/export` as a Blob (RFC 4180 CSV) with the same filters as the list. The shared client reads JSON
 * only, so this fetch is done by hand with the same bearer token and error shape.
 */
export async function exportAudit(query: AuditQuery): Promise<{ blob: Blob; fileName: string }> {
  const params = new URLSearchParams(Object.entries(query).filter((e): e is [string, string] => typeof e[1] === 'string' && e[1] !== ''));
  const token = tokenStore.get();
  let res: Response;
  try {
    res = await fetch(`${apiBase}${apiPaths.auditExport}?${params.toString()}`, {
      headers: { Accept: 'text/csv', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached, so the audit trail could not be exported.');
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
  const fileName = /filename="([^"]+)"/.exec(res.headers.get('Content-Disposition') ?? '')?.[1] ?? 'audit-trail.csv';
  return { blob: await res.blob(), fileName };
}
