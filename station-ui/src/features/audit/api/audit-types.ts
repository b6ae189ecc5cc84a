/** Shapes of the audit API (station-api/src/audit/dto/audit.dto.ts), typed by hand until the lead regenerates api-types. */

export interface AuditChange {
  field: string;
  before: string | null;
  after: string | null;
}

export interface AuditLink {
  kind: string;
  id: string;
  label: string;
  serial?: string;
  planId?: number;
}

export interface AuditEntry {
  id: number;
  at: string;
  actorId: number | null;
  actorName: string | null;
  actorDisplayName: string | null;
  action: string;
  what: string;
  entityType: string;
  entityId: string | null;
  reason: string | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  changes: AuditChange[];
  link: AuditLink | null;
}

export interface AuditPage {
  items: AuditEntry[];
  total: number;
}

export interface AuditChoices {
  entityTypes: { type: string; words: string }[];
  users: { username: string; displayName: string }[];
}

/** What the server filters by (ISO instants for the range). */
export interface AuditQuery {
  entityType?: string;
  entityId?: string;
  user?: string;
  action?: string;
  q?: string;
  from?: string;
  to?: string;
}
