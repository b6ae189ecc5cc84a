import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { CreateRepairCauseDto, RepairCauseDto, UpdateRepairCauseDto } from './dto/repair-cause.dto';
import { RepairCause } from './repair-cause.entity';

/** Audit action codes of the cause list (plain words in the report and docs/repair.md). */
export const CAUSE_AUDIT_ACTIONS = {
  created: 'repair_cause.created',
  renamed: 'repair_cause.renamed',
  switchedOff: 'repair_cause.switched_off',
  switchedOn: 'repair_cause.switched_on',
  deleted: 'repair_cause.deleted',
} as const;

/**
 * The list of repair causes engineers maintain: add, rename, switch off or on, and delete one never used.
 * Every change is audited (entityType `repair_cause`).
 */
@Injectable()
export class RepairCausesService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
  ) {}

  /** Alphabetical; only active causes unless `all`. */
  async list(all: boolean): Promise<RepairCauseDto[]> {
    const rows = await this.em.execute<{ id: number; name: string; active: number | boolean; record_count: number }[]>(
      `select c.id, c.name, c.active, (select count(*) from repair_records r where r.cause_id = c.id) as record_count
       from repair_causes c ${all ? '' : 'where c.active = 1 '}order by c.name collate nocase, c.id`,
    );
    return rows.map((r) => ({ id: Number(r.id), name: r.name, active: Boolean(r.active), recordCount: Number(r.record_count) }));
  }

  async create(dto: CreateRepairCauseDto, actorId: number): Promise<RepairCauseDto> {
    const em = this.em.fork();
    await this.refuseDuplicate(em, dto.name);
    const cause = em.create(RepairCause, { name: dto.name, active: true });
    em.persist(cause);
    await em.flush();
    await this.audit.record({ actor: actorId, action: CAUSE_AUDIT_ACTIONS.created, entityType: 'repair_cause', entityId: cause.id, after: { name: cause.name, active: true } });
    return { id: cause.id, name: cause.name, active: cause.active, recordCount: 0 };
  }

  async update(id: number, dto: UpdateRepairCauseDto, actorId: number): Promise<RepairCauseDto> {
    const em = this.em.fork();
    return em.transactional(async (tx) => {
      const cause = await this.found(tx, id);
      const before = { name: cause.name, active: cause.active };
      if (dto.name !== undefined && dto.name !== cause.name) {
        await this.refuseDuplicate(tx, dto.name, cause.id);
        cause.name = dto.name;
        await this.audit.record({ actor: actorId, action: CAUSE_AUDIT_ACTIONS.renamed, entityType: 'repair_cause', entityId: cause.id, before, after: { name: cause.name, active: cause.active } }, tx);
      }
      if (dto.active !== undefined && dto.active !== cause.active) {
        const was = { name: cause.name, active: cause.active };
        cause.active = dto.active;
        await this.audit.record(
          { actor: actorId, action: dto.active ? CAUSE_AUDIT_ACTIONS.switchedOn : CAUSE_AUDIT_ACTIONS.switchedOff, entityType: 'repair_cause', entityId: cause.id, before: was, after: { name: cause.name, active: cause.active } },
          tx,
        );
      }
      await tx.flush();
      return { id: cause.id, name: cause.name, active: cause.active, recordCount: await this.useCount(tx, cause.id) };
    });
  }

  /** Deletes a cause no record names; one in use is refused (switch it off instead). */
  async remove(id: number, actorId: number): Promise<void> {
    await this.em.fork().transactional(async (tx) => {
      const cause = await this.found(tx, id);
      const used = await this.useCount(tx, id);
      if (used > 0) {
        throw new ConflictException({
          message: `"${cause.name}" is named by ${used} repair ${used === 1 ? 'record' : 'records'}, so it cannot be deleted. Switch it off instead: it is then no longer offered, and the records keep it.`,
          details: { code: 'cause_in_use', recordCount: used },
        });
      }
      await this.audit.record({ actor: actorId, action: CAUSE_AUDIT_ACTIONS.deleted, entityType: 'repair_cause', entityId: cause.id, before: { name: cause.name, active: cause.active } }, tx);
      tx.remove(cause);
      await tx.flush();
    });
  }

  private async found(em: EntityManager, id: number): Promise<RepairCause> {
    const cause = await em.findOne(RepairCause, { id });
    if (!cause) throw new NotFoundException({ message: `There is no repair cause with id ${id}.`, details: { code: 'unknown_cause' } });
    return cause;
  }

  private async useCount(em: EntityManager, id: number): Promise<number> {
    const [{ n }] = await em.execute<{ n: number }[]>('select count(*) as n from repair_records where cause_id = ?', [id]);
    return Number(n);
  }

  private async refuseDuplicate(em: EntityManager, name: string, exceptId?: number): Promise<void> {
    const rows = await em.execute<{ id: number; name: string }[]>('select id, name from repair_causes where lower(name) = lower(?)', [name]);
    const clash = rows.find((r) => Number(r.id) !== exceptId);
    if (clash) {
      throw new ConflictException({ message: `A repair cause called "${clash.name}" already exists.`, details: { code: 'duplicate_cause', causeId: Number(clash.id) } });
    }
  }
}
