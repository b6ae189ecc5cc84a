import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { User } from '../users/user.entity';
import { AuditEvent } from './audit-event.entity';
import type { AuditEventDto, AuditQueryDto } from './dto/audit.dto';

/** One thing that happened, as a feature reports it. */
export interface AuditEntry {
  /** Signed-in user who did it (id or entity); absent for failed sign-ins and seeding */
  actor?: { id: number } | number;
  /** Name as given, kept even when no user matches (failed sign-ins) */
  actorName?: string;
  /** dotted verb, e.g. `user.created`, `fixture.calibrated`, `auth.login_failed` */
  action: string;
  entityType: string;
  entityId?: string | number;
  reason?: string;
  /** State before and after the change (plain data; secret fields are dropped) */
  before?: object;
  after?: object;
}

/** Keys never written to the audit trail, whatever a caller passes. */
const SECRET_KEYS = new Set(['password', 'passwordHash', 'accessToken', 'token']);

function scrub(value: object | undefined): Record<string, unknown> | undefined {
  if (!value) return undefined;
  return Object.fromEntries(Object.entries(value).filter(([k]) => !SECRET_KEYS.has(k)));
}

@Injectable()
export class AuditService {
  constructor(private readonly em: EntityManager) {}

  /**
   * Records an audit event. With `em`, the event joins that unit of work and is written by the caller's
   * flush (so the change and its audit land together or not at all). Without it, the event is written
   * at once on its own fork (used where the request fails afterwards, e.g. a refused sign-in).
   */
  async record(entry: AuditEntry, em?: EntityManager): Promise<AuditEvent> {
    const target = em ?? this.em.fork();
    const actorId = typeof entry.actor === 'number' ? entry.actor : entry.actor?.id;
    const event = target.create(AuditEvent, {
      at: new Date(),
      actor: actorId !== undefined ? target.getReference(User, actorId) : undefined,
      actorName: entry.actorName,
      action: entry.action,
      entityType: entry.entityType,
      entityId: entry.entityId !== undefined ? String(entry.entityId) : undefined,
      reason: entry.reason,
      before: scrub(entry.before),
      after: scrub(entry.after),
    }, { partial: true });
    if (em) target.persist(event);
    else await target.persistAndFlush(event);
    return event;
  }

  /** Newest first. */
  async list(query: AuditQueryDto): Promise<{ items: AuditEventDto[]; total: number }> {
    const where: Record<string, unknown> = {};
    if (query.entityType) where.entityType = query.entityType;
    if (query.entityId) where.entityId = query.entityId;
    if (query.action) where.action = query.action;
    const [rows, total] = await this.em.findAndCount(AuditEvent, where, {
      orderBy: { at: 'desc', id: 'desc' },
      limit: query.limit ?? 100,
      offset: query.offset ?? 0,
      populate: ['actor'],
    });
    return { items: rows.map(toAuditEventDto), total };
  }
}

export function toAuditEventDto(e: AuditEvent): AuditEventDto {
  return {
    id: e.id,
    at: e.at.toISOString(),
    actorId: e.actor?.id ?? null,
    actorName: e.actorName ?? e.actor?.username ?? null,
    action: e.action,
    entityType: e.entityType,
    entityId: e.entityId ?? null,
    reason: e.reason ?? null,
    before: e.before ?? null,
    after: e.after ?? null,
  };
}
