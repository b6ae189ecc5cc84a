import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** One audit entry, as `GET /api/audit` lists it (station-api/src/audit/dto/audit.dto.ts). */
export interface AuditEntry {
  id: number;
  /** ISO 8601, UTC */
  at: string;
  actorId: number | null;
  /** User name as given (for a failed sign-in the user may not exist) */
  actorName: string | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  reason?: string | null;
  before?: Record<string, unknown> | null;
  after?: Record<string, unknown> | null;
}

/** The filters the server accepts; it refuses any other query field. */
export interface AuditFilters {
  /** Action name, e.g. `auth.login_failed` (exact match) */
  action?: string;
  /** Kind of record, e.g. `user` */
  entityType?: string;
  entityId?: string;
  limit: number;
  offset: number;
}

export interface AuditPage {
  items: AuditEntry[];
  total: number;
}

export async function getAudit(filters: AuditFilters): Promise<AuditPage> {
  return api.get<AuditPage>(apiPaths.audit, { query: { ...filters } });
}

export const auditQueryOptions = (filters: AuditFilters) =>
  queryOptions({
    queryKey: ['admin', 'audit', filters] as const,
    queryFn: () => getAudit(filters),
    // Keep the old page on screen while the next one loads, so the table does not collapse.
    placeholderData: keepPreviousData,
  });

export function useAudit(filters: AuditFilters) {
  return useQuery(auditQueryOptions(filters));
}
