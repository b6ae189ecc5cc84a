import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ApiQuery, AuditEventDto, AuditPageDto } from '@/lib/api-schema';

/** One audit entry, as `GET /api/audit` lists it (the server's AuditEventDto). */
export type AuditEntry = AuditEventDto;

/** The filters the server accepts (it refuses any other query field); the screen always pages. */
export type AuditFilters = ApiQuery<'AuditController_list'> & { limit: number; offset: number };

export type AuditPage = AuditPageDto;

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
