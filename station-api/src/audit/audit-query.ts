import { BadRequestException } from '@nestjs/common';
import type { AuditFilterDto } from './dto/audit.dto';

/** The filters after checking, ready for SQL. */
export interface CheckedAuditFilter {
  entityType?: string;
  entityIds?: string[];
  action?: string;
  /** user id and sign-in name: failed sign-ins keep only the name */
  user?: { id: number; username: string };
  q?: string;
  fromMs?: number;
  toMs?: number;
  /** sign-ins and board links are for administrators only */
  adminView: boolean;
}

function refuse(field: string, message: string): BadRequestException {
  return new BadRequestException({ message, details: [{ field, problems: [message] }] });
}

/** Dates already passed the ISO 8601 check of the DTO; here: a real instant, and from before to. */
export function checkedRange(f: AuditFilterDto): { fromMs?: number; toMs?: number } {
  const fromMs = f.from !== undefined ? Date.parse(f.from) : undefined;
  const toMs = f.to !== undefined ? Date.parse(f.to) : undefined;
  if (fromMs !== undefined && Number.isNaN(fromMs)) throw refuse('from', `from "${f.from}" is not a date; use ISO 8601, e.g. 2026-12-01T00:00:00Z.`);
  if (toMs !== undefined && Number.isNaN(toMs)) throw refuse('to', `to "${f.to}" is not a date; use ISO 8601, e.g. 2026-12-02T00:00:00Z.`);
  if (fromMs !== undefined && toMs !== undefined && fromMs > toMs) {
    throw refuse('from', `The range starts (${f.from}) after it ends (${f.to}); swap the two dates.`);
  }
  return { fromMs, toMs };
}

export function unknownUser(username: string): BadRequestException {
  return refuse('user', `Nobody signs in as "${username}"; choose a person from the list.`);
}

export function unknownType(type: string, known: string[]): BadRequestException {
  return refuse('entityType', `"${type}" is not a kind of object in the audit trail; use one of: ${known.join(', ')}.`);
}

/** `%` and `_` typed by a person are literal characters, not wildcards. */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** WHERE clause over `audit_events e left join users u on u.id = e.actor_id`. */
export function whereSql(f: CheckedAuditFilter): { sql: string; params: unknown[] } {
  const parts: string[] = [];
  const params: unknown[] = [];
  if (!f.adminView) parts.push(`e.action not like 'auth.%'`);
  if (f.entityType) {
    parts.push('e.entity_type = ?');
    params.push(f.entityType);
  }
  if (f.entityIds) {
    parts.push(`e.entity_id in (${f.entityIds.map(() => '?').join(', ')})`);
    params.push(...f.entityIds);
  }
  if (f.action) {
    parts.push('e.action = ?');
    params.push(f.action);
  }
  if (f.user) {
    parts.push('(e.actor_id = ? or (e.actor_id is null and e.actor_name = ?))');
    params.push(f.user.id, f.user.username);
  }
  if (f.fromMs !== undefined) {
    parts.push('e.at >= ?');
    params.push(f.fromMs);
  }
  if (f.toMs !== undefined) {
    parts.push('e.at < ?');
    params.push(f.toMs);
  }
  if (f.q) {
    const like = likePattern(f.q);
    const columns = ['e.reason', 'e.actor_name', 'u.username', 'u.display_name', 'e.entity_id', 'e.before', 'e.after'];
    parts.push(`(${columns.map((c) => `${c} like ? escape '\\'`).join(' or ')})`);
    params.push(...columns.map(() => like));
  }
  return { sql: parts.length ? `where ${parts.join(' and ')}` : '', params };
}
