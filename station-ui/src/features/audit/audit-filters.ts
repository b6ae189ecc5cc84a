import type { AuditQuery } from './api/audit-types';

/**
 * The audit screen's filters as they sit in the address (`/audit?type=unit&id=K5A-…&user=engineer&from=2026-12-01`),
 * so a link can point at a filtered view. Dates are the plant's local calendar days; `to` includes its whole day.
 */
export interface AuditFilters {
  type: string;
  id: string;
  user: string;
  action: string;
  q: string;
  from: string;
  to: string;
}

export const emptyAuditFilters: AuditFilters = { type: '', id: '', user: '', action: '', q: '', from: '', to: '' };

const DAY = /^\d{4}-\d{2}-\d{2}$/;

export function auditFiltersFromParams(params: URLSearchParams): { filters: AuditFilters; page: number } {
  const filters = { ...emptyAuditFilters };
  for (const k of Object.keys(emptyAuditFilters) as (keyof AuditFilters)[]) filters[k] = params.get(k)?.trim() ?? '';
  const page = Number.parseInt(params.get('page') ?? '1', 10);
  return { filters, page: Number.isFinite(page) && page >= 1 ? page : 1 };
}

export function auditParamsFrom(filters: AuditFilters, page = 1): URLSearchParams {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filters)) if (v.trim()) params.set(k, v.trim());
  if (page > 1) params.set('page', String(page));
  return params;
}

/** Local midnight of a `yyyy-mm-dd` day as an ISO instant; `plusDays` moves it (the end of a range is exclusive). */
export function localDayStart(day: string, plusDays = 0): string | undefined {
  if (!DAY.test(day)) return undefined;
  const [y, m, d] = day.split('-').map(Number);
  const t = new Date(y, m - 1, d + plusDays);
  return Number.isNaN(t.getTime()) ? undefined : t.toISOString();
}

/** Why the range cannot be used, in words, or null. */
export function rangeProblem(f: Pick<AuditFilters, 'from' | 'to'>): string | null {
  if (f.from && !DAY.test(f.from)) return 'Enter the first day as a date.';
  if (f.to && !DAY.test(f.to)) return 'Enter the last day as a date.';
  if (f.from && f.to && f.from > f.to) return 'The first day is after the last day.';
  return null;
}

/** What the server is asked for: ids and names as given, the range as instants (`to` through the end of its day). */
export function auditQueryFrom(f: AuditFilters): AuditQuery {
  return {
    entityType: f.type || undefined,
    entityId: f.id || undefined,
    user: f.user || undefined,
    action: f.action || undefined,
    q: f.q || undefined,
    from: f.from ? localDayStart(f.from) : undefined,
    to: f.to ? localDayStart(f.to, 1) : undefined,
  };
}
