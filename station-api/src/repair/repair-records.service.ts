import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import { paretoTable } from '../stats';
import { User } from '../users/user.entity';
import { resolveFilter } from '../yield/yield-filter';
import type { CorrectRepairRecordDto } from './dto/repair.dto';
import type { RepairParetoDto, RepairParetoQueryDto, RepairRecordDto, RepairRecordListDto, RepairRecordQueryDto } from './dto/repair-record.dto';
import { RepairCause } from './repair-cause.entity';
import { RepairRecord } from './repair-record.entity';
import { RECORD_VIEW_SELECT, recordForAudit, rowToRecord } from './repair-record-views';

/** Audit action code of a correction (entityType `unit`, like every repair step). */
export const RECORD_CORRECTED_ACTION = 'unit.repair_record_corrected';

/** Repair records: reading them, correcting one with a new record, and the Pareto by cause. */
@Injectable()
export class RepairRecordsService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
  ) {}

  /** Newest first; one serial's records (any case) or all. */
  async list(q: RepairRecordQueryDto): Promise<RepairRecordListDto> {
    const conn = this.em.getConnection();
    const where = q.serial ? ' where u.serial = ? collate nocase' : '';
    const params = q.serial ? [q.serial] : [];
    const rows = await conn.execute<Record<string, unknown>[]>(`${RECORD_VIEW_SELECT}${where} order by rr.recorded_at desc, rr.id desc limit ? offset ?`, [...params, q.limit ?? 50, q.offset ?? 0]);
    const [{ n }] = await conn.execute<{ n: number }[]>(`select count(*) as n from repair_records rr join units u on u.id = rr.unit_id${where}`, params);
    return { items: rows.map(rowToRecord), total: Number(n) };
  }

  async one(em: EntityManager, id: number): Promise<RepairRecordDto> {
    const [row] = await em.execute<Record<string, unknown>[]>(`${RECORD_VIEW_SELECT} where rr.id = ?`, [id]);
    if (!row) throw new NotFoundException({ message: `There is no repair record with id ${id}.`, details: { code: 'unknown_record' } });
    return rowToRecord(row);
  }

  /**
   * A record is never edited: a correction is a new record for the same unit with the same disposition (the
   * unit already moved), pointing at the one it corrects. Only the newest record of a chain can be corrected.
   */
  async correct(id: number, dto: CorrectRepairRecordDto, actorId: number): Promise<RepairRecordDto> {
    return this.em.fork().transactional(async (em) => {
      const original = await em.findOne(RepairRecord, { id }, { populate: ['cause', 'unit'] });
      if (!original) throw new NotFoundException({ message: `There is no repair record with id ${id}.`, details: { code: 'unknown_record' } });
      const newer = await em.findOne(RepairRecord, { corrects: id }, { orderBy: { id: 'desc' } });
      if (newer) {
        throw new ConflictException({
          message: `Repair record ${id} was already corrected by record ${newer.id}; correct record ${newer.id} instead.`,
          details: { code: 'record_already_corrected', correctedById: newer.id },
        });
      }
      const cause = await activeCause(em, dto.causeId);
      const record = em.create(RepairRecord, {
        unit: original.unit,
        cause,
        symptom: dto.symptom,
        actionTaken: dto.actionTaken,
        disposition: original.disposition,
        technician: em.getReference(User, actorId),
        recordedAt: new Date(),
        failedRun: original.failedRun,
        corrects: original,
        correctionReason: dto.reason,
      });
      em.persist(record);
      await em.flush();
      await this.audit.record(
        {
          actor: actorId,
          action: RECORD_CORRECTED_ACTION,
          entityType: 'unit',
          entityId: original.unit.id,
          reason: dto.reason,
          before: { serial: original.unit.serial, state: original.unit.state, repairRecord: recordForAudit({ ...original, causeId: original.cause.id, causeName: original.cause.name }) },
          after: { serial: original.unit.serial, state: original.unit.state, repairRecord: recordForAudit({ ...record, causeId: cause.id, causeName: cause.name, correctsId: original.id }) },
        },
        em,
      );
      await em.flush();
      return this.one(em, record.id);
    });
  }

  /**
   * Pareto by cause over the current repair records (a corrected record counts only through its correction),
   * filtered like the yield Pareto: the unit's lot and product, and the day the record was written.
   */
  async pareto(q: RepairParetoQueryDto): Promise<RepairParetoDto> {
    const f = resolveFilter(q);
    const parts: string[] = ['not exists (select 1 from repair_records x where x.corrects_id = rr.id)'];
    const params: unknown[] = [];
    if (f.lotId !== undefined) {
      parts.push('u.lot_id = ?');
      params.push(f.lotId);
    }
    if (f.productId !== undefined) {
      parts.push('u.product_id = ?');
      params.push(f.productId);
    }
    // dates are stored as epoch milliseconds (the ORM's SQLite mapping)
    if (f.fromMs !== undefined) {
      parts.push('rr.recorded_at >= ?');
      params.push(f.fromMs);
    }
    if (f.toMs !== undefined) {
      parts.push('rr.recorded_at < ?');
      params.push(f.toMs);
    }
    const rows = await this.em.execute<{ cause_id: number; name: string; n: number }[]>(
      `select c.id as cause_id, c.name, count(*) as n
       from repair_records rr join units u on u.id = rr.unit_id join repair_causes c on c.id = rr.cause_id
       where ${parts.join(' and ')} group by c.id, c.name`,
      params,
    );
    const ids = new Map(rows.map((r) => [r.name, Number(r.cause_id)]));
    const bars = paretoTable(rows.map((r) => ({ key: r.name, count: Number(r.n) }))).map((b) => ({ ...b, label: b.key, causeId: ids.get(b.key)! }));
    return { records: bars.reduce((a, b) => a + b.count, 0), bars };
  }
}

/** The cause a new record names: it must exist and be switched on (400 naming causeId otherwise). */
export async function activeCause(em: EntityManager, causeId: number): Promise<RepairCause> {
  const cause = await em.findOne(RepairCause, { id: causeId });
  if (!cause) {
    throw new BadRequestException({
      message: `causeId: there is no repair cause with id ${causeId}; choose one from the list.`,
      details: [{ field: 'causeId', problems: [`there is no repair cause with id ${causeId}`] }],
    });
  }
  if (!cause.active) {
    throw new BadRequestException({
      message: `causeId: the cause "${cause.name}" is switched off; choose an active cause, or ask an engineer to switch it on again.`,
      details: [{ field: 'causeId', problems: [`the cause "${cause.name}" is switched off`] }],
    });
  }
  return cause;
}
