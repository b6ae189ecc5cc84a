import { apiPaths } from '@/config/paths';
import { downloadCsv } from '@/lib/csv-download';
import type { AuditQuery } from './audit-types';

/** `GET /api/audit/export` as a Blob (RFC 4180 CSV) with the same filters as the list. */
export async function exportAudit(query: AuditQuery): Promise<{ blob: Blob; fileName: string }> {
  const params = new URLSearchParams(Object.entries(query).filter((e): e is [string, string] => typeof e[1] === 'string' && e[1] !== ''));
  return downloadCsv(apiPaths.auditExport, params, 'the audit trail', 'audit-trail.csv');
}
