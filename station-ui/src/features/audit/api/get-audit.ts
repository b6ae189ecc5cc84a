import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { AuditChoices, AuditPage, AuditQuery } from './audit-types';

export type AuditPageQuery = AuditQuery & { limit: number; offset: number };

export async function getAudit(query: AuditPageQuery): Promise<AuditPage> {
  return api.get<AuditPage>(apiPaths.audit, { query: { ...query } });
}

export const auditQueryOptions = (query: AuditPageQuery) =>
  queryOptions({
    queryKey: ['audit', 'list', query] as const,
    queryFn: () => getAudit(query),
    // keep the old page on screen while the next one loads, so the table does not collapse
    placeholderData: keepPreviousData,
  });

/** `enabled: false` while the filters on the page cannot be sent (a reversed range): the screen explains instead. */
export function useAudit(query: AuditPageQuery, enabled = true) {
  return useQuery({ ...auditQueryOptions(query), enabled });
}

export function useAuditChoices() {
  return useQuery({
    queryKey: ['audit', 'choices'] as const,
    queryFn: () => api.get<AuditChoices>(apiPaths.auditChoices),
    staleTime: 60_000,
  });
}
