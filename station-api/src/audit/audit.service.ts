import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable } from '@nestjs/common';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { User } from '../users/user.entity';
import { csvText } from './audit-csv';
import { AuditEvent } from './audit-event.entity';
import { loadAuditLabels } from './audit-labels';
import { checkedRange, unknownType, unknownUser, whereSql, type CheckedAuditFilter } from './audit-query';
import { describeAudit, ENTITY_TYPE_WORDS } from './audit-words';
import type { AuditChoicesDto, AuditEventDto, AuditFilterDto, AuditPageDto, AuditQueryDto } from './dto/audit.dto';

/** More rows than this in one export: the person narrows the filters (a file that size is no longer read). */
export const AUDIT_EXPORT_MAX_ROWS = 50_000;

interface AuditRow {
  id: number;
  at: number | string;
  actor_id: number | null;
  actor_name: string | null;
  username: string | null;
  display_name: string | null;
  action: string;
  entity_type: string;
  entity_id: string | null;
  reason: string | null;
  before: string | null;
  after: string | null;
}

const SELECT =
  'select e.id, e.at, e.actor_id, e.actor_name, u.username, u.display_name, e.action, e.entity_type, e.entity_id, e.reason, e.before, e.after ' +
  'from audit_events e left join users u on u.id = e.actor_id';

const json = (text: string | null): Record<string, unknown> | null => {
  if (text === null) return null;
  try {
    return JSON.parse(text) as Record<string, unknown>;
  } catch {
    return { text };
  }
};

const isAdmin = (viewer: Pick<AuthUser, 'roles'>) => viewer.roles.includes('admin');

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

  /** Newest first, filtered, one page; each record in words with its link. */
  async list(query: AuditQueryDto, viewer: Pick<AuthUser, 'roles'>): Promise<AuditPageDto> {
    const filter = await this.checked(query, viewer);
    const where = whereSql(filter);
    const [count] = await this.sql(`select count(*) as n from audit_events e left join users u on u.id = e.actor_id ${where.sql}`, where.params);
    const rows = (await this.sql(`${SELECT} ${where.sql} order by e.at desc, e.id desc limit ? offset ?`, [...where.params, query.limit ?? 50, query.offset ?? 0])) as unknown as AuditRow[];
    return { items: await this.described(rows), total: Number(count.n) };
  }

  /** The same filtered set as a CSV file (every matching record, not one page). */
  async exportCsv(filters: AuditFilterDto, viewer: Pick<AuthUser, 'roles'>): Promise<string> {
    const filter = await this.checked(filters, viewer);
    const where = whereSql(filter);
    const [count] = await this.sql(`select count(*) as n from audit_events e left join users u on u.id = e.actor_id ${where.sql}`, where.params);
    if (Number(count.n) > AUDIT_EXPORT_MAX_ROWS) {
      throw new BadRequestException({
        message: `${count.n} records match; an export holds at most ${AUDIT_EXPORT_MAX_ROWS}. Narrow the date range or the other filters.`,
        details: { code: 'export_too_large', matching: Number(count.n), max: AUDIT_EXPORT_MAX_ROWS },
      });
    }
    const rows = (await this.sql(`${SELECT} ${where.sql} order by e.at desc, e.id desc`, where.params)) as unknown as AuditRow[];
    const items = await this.described(rows);
    return csvText(
      ['When (UTC)', 'Who', 'What', 'Why', 'Changes', 'Object type', 'Object', 'Action code', 'Record id'],
      items.map((e) => [
        e.at,
        e.actorDisplayName ? `${e.actorDisplayName} (${e.actorName})` : e.actorName,
        e.what,
        e.reason,
        e.changes.map((c) => `${c.field}: ${c.before ?? '(none)'} → ${c.after ?? '(none)'}`).join('; '),
        ENTITY_TYPE_WORDS[e.entityType] ?? e.entityType,
        e.link?.label ?? e.entityId,
        e.action,
        e.id,
      ]),
    );
  }

  /** Object types and people that appear in the trail, for the filter choices. */
  async choices(viewer: Pick<AuthUser, 'roles'>): Promise<AuditChoicesDto> {
    const hide = isAdmin(viewer) ? '' : `where action not like 'auth.%'`;
    const types = await this.sql(`select distinct entity_type as t from audit_events ${hide} order by entity_type`, []);
    const users = await this.sql(`select username, display_name from users where id in (select distinct actor_id from audit_events ${hide}) order by username`, []);
    return {
      entityTypes: types.map((r) => String(r.t)).map((t) => ({ type: t, words: ENTITY_TYPE_WORDS[t] ?? t.replace(/_/g, ' ') })),
      users: users.map((r) => ({ username: String(r.username), displayName: String(r.display_name) })),
    };
  }

  /** Every record about the given objects, newest first, in words (the unit history reads repairs this way). */
  async eventsFor(objects: { entityType: string; ids: string[] }[]): Promise<AuditEventDto[]> {
    const parts = objects.filter((o) => o.ids.length > 0);
    if (parts.length === 0) return [];
    const sql = parts.map((o) => `(e.entity_type = ? and e.entity_id in (${o.ids.map(() => '?').join(', ')}))`).join(' or ');
    const rows = (await this.sql(`${SELECT} where ${sql} order by e.at desc, e.id desc`, parts.flatMap((o) => [o.entityType, ...o.ids]))) as unknown as AuditRow[];
    return this.described(rows);
  }

  private sql(query: string, params: unknown[]): Promise<Record<string, unknown>[]> {
    return this.em.getConnection().execute(query, params);
  }

  /** Checks what the DTO cannot: a real range, a known person, a known object type; a unit may be named by serial. */
  private async checked(f: AuditFilterDto, viewer: Pick<AuthUser, 'roles'>): Promise<CheckedAuditFilter> {
    const range = checkedRange(f);
    const out: CheckedAuditFilter = { ...range, adminView: isAdmin(viewer), action: f.action, entityType: f.entityType, q: f.q?.trim() || undefined };
    if (f.user !== undefined) {
      const name = f.user.trim();
      const [u] = await this.sql('select id, username from users where username = ? collate nocase', [name]);
      if (!u) throw unknownUser(name);
      out.user = { id: Number(u.id), username: String(u.username) };
    }
    if (f.entityType && !ENTITY_TYPE_WORDS[f.entityType]) {
      const [seen] = await this.sql('select 1 as x from audit_events where entity_type = ? limit 1', [f.entityType]);
      if (!seen) throw unknownType(f.entityType, Object.keys(ENTITY_TYPE_WORDS));
    }
    if (f.entityId !== undefined) {
      const id = f.entityId.trim();
      out.entityIds = [id];
      // a unit is known to people by its serial; its records carry the unit id
      if (f.entityType === 'unit' && !/^\d+$/.test(id)) {
        const [unit] = await this.sql('select id from units where serial = ?', [id.toUpperCase()]);
        out.entityIds = unit ? [String(unit.id)] : [id];
      }
    }
    return out;
  }

  private async described(rows: AuditRow[]): Promise<AuditEventDto[]> {
    const facts = rows.map((r) => ({ entityType: r.entity_type, entityId: r.entity_id, action: r.action }));
    const labels = await loadAuditLabels(this.em, facts);
    return rows.map((r) => {
      const before = json(r.before);
      const after = json(r.after);
      const { what, changes } = describeAudit({
        action: r.action,
        entityType: r.entity_type,
        entityId: r.entity_id,
        actorName: r.actor_name ?? r.username,
        reason: r.reason,
        before,
        after,
        label: labels.label(r.entity_type, r.entity_id),
        plan: r.action === 'plan_version.edited' ? labels.planNames(r.entity_id) : null,
      });
      return {
        id: r.id,
        at: new Date(typeof r.at === 'number' ? r.at : Number(r.at) || Date.parse(r.at)).toISOString(),
        actorId: r.actor_id,
        actorName: r.actor_name ?? r.username,
        actorDisplayName: r.display_name,
        action: r.action,
        what,
        entityType: r.entity_type,
        entityId: r.entity_id,
        reason: r.reason,
        before,
        after,
        changes,
        link: labels.link(r.entity_type, r.entity_id, after),
      };
    });
  }
}
