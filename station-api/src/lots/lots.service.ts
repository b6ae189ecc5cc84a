import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import type { Product } from '../products/product.entity';
import { ProductsService } from '../products/products.service';
import { Unit, UnitState } from '../units/unit.entity';
import type { CreateLotDto, LotDetailDto, LotDto, LotQueryDto, LotUnitDto, UnitCountsDto } from './dto/lot.dto';
import { LotCertificate } from './lot-certificate.entity';
import { createLotWithSerials, describeTaken, takenSerials } from './lot-creation';
import { Lot } from './lot.entity';
import { registerLot } from './lot-registration';
import { expandSerials, type SerialInput } from './serial-input';

const emptyCounts = (): UnitCountsDto => ({ untested: 0, passed: 0, failed: 0, in_repair: 0, scrapped: 0, total: 0 });

export function toLotDto(lot: Lot, counts: UnitCountsDto = emptyCounts(), hasCertificate = false): LotDto {
  return {
    id: lot.id,
    code: lot.code,
    state: lot.state,
    holdReason: lot.holdReason ?? null,
    plannedQuantity: lot.plannedQuantity,
    product: { id: lot.product.id, partNumber: lot.product.partNumber, name: lot.product.name },
    createdAt: lot.createdAt.toISOString(),
    unitCounts: counts,
    releasedAt: lot.releasedAt?.toISOString() ?? null,
    releasedBy: lot.releasedBy?.displayName ?? null,
    closedAt: lot.closedAt?.toISOString() ?? null,
    closedBy: lot.closedBy?.displayName ?? null,
    closeReason: lot.closeReason ?? null,
    hasCertificate,
  };
}

/** How the serials of a new lot are given: a range, a list, or (neither) the next free ones of this week. */
function serialInputOf(dto: CreateLotDto): SerialInput | null {
  const hasRange = dto.firstSerial !== undefined || dto.lastSerial !== undefined;
  if (hasRange && dto.serials !== undefined) {
    throw new BadRequestException({ message: 'Give either a serial range (firstSerial, lastSerial) or a list (serials), not both.', details: [{ field: 'serials', problems: ['give a range or a list, not both'] }] });
  }
  if ((hasRange || dto.serials !== undefined) && dto.firstSequence !== undefined) {
    throw new BadRequestException({ message: 'firstSequence is only for the next free serials of this week; leave it out with a range or a list.', details: [{ field: 'firstSequence', problems: ['leave it out with a range or a list'] }] });
  }
  if (hasRange) {
    const missing = dto.firstSerial === undefined ? 'firstSerial' : dto.lastSerial === undefined ? 'lastSerial' : null;
    if (missing) throw new BadRequestException({ message: `A range needs both its first and its last serial; ${missing} is missing.`, details: [{ field: missing, problems: ['missing'] }] });
    return { kind: 'range', firstSerial: dto.firstSerial!, lastSerial: dto.lastSerial! };
  }
  return dto.serials !== undefined ? { kind: 'list', serials: dto.serials } : null;
}

@Injectable()
export class LotsService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly products: ProductsService,
  ) {}

  /** Newest first. */
  async list(query: LotQueryDto): Promise<LotDto[]> {
    const where: Record<string, unknown> = {};
    if (query.productId) where.product = query.productId;
    if (query.state) where.state = query.state;
    const lots = await this.em.find(Lot, where, { populate: ['product', 'releasedBy', 'closedBy'], orderBy: { createdAt: 'desc', id: 'desc' } });
    const ids = lots.map((l) => l.id);
    const counts = await this.unitCounts(ids);
    const certified = await this.certified(ids);
    return lots.map((l) => toLotDto(l, counts.get(l.id), certified.has(l.id)));
  }

  async getEntity(id: number): Promise<Lot> {
    const lot = await this.em.findOne(Lot, { id }, { populate: ['product', 'releasedBy', 'closedBy'] });
    if (!lot) throw new NotFoundException({ message: `There is no lot with id ${id}.`, details: { code: 'unknown_lot' } });
    return lot;
  }

  async get(id: number): Promise<LotDetailDto> {
    const lot = await this.getEntity(id);
    const counts = await this.unitCounts([lot.id]);
    const certified = await this.certified([lot.id]);
    const [range] = await this.em
      .getConnection()
      .execute<{ first: string | null; last: string | null }[]>('select min(serial) as first, max(serial) as last from units where lot_id = ?', [lot.id]);
    return { ...toLotDto(lot, counts.get(lot.id), certified.has(lot.id)), firstSerial: range?.first ?? null, lastSerial: range?.last ?? null };
  }

  /** Every unit of the lot, by serial. */
  async units(id: number): Promise<LotUnitDto[]> {
    const lot = await this.getEntity(id);
    const units = await this.em.find(Unit, { lot: lot.id }, { orderBy: { serial: 'asc' } });
    return units.map((u) => ({ serial: u.serial, state: u.state, testCount: u.testCount, lastTestedAt: u.lastTestedAt?.toISOString() ?? null }));
  }

  /** Checks a product for a new lot: it must be active. */
  requireActive(product: Product): void {
    if (!product.active) {
      throw new ConflictException({ message: `Product ${product.partNumber} is inactive; reactivate it before opening a lot.`, details: { code: 'product_inactive' } });
    }
  }

  /**
   * Creates the lot and registers all its units in one transaction: serials from a range or a list (checked
   * against the product's serial format and against every registered serial), or the next free ones of this week.
   */
  async create(dto: CreateLotDto, actor: AuthUser): Promise<LotDetailDto> {
    const product = await this.products.getEntity(dto.productId);
    this.requireActive(product);
    const input = serialInputOf(dto);
    let serials: string[] | null = null;
    if (input) {
      const expanded = expandSerials(input, product.serialPattern, dto.plannedQuantity);
      if (!expanded.ok) {
        const byField = new Map<string, string[]>();
        for (const p of expanded.problems) byField.set(p.field, [...(byField.get(p.field) ?? []), p.message]);
        throw new BadRequestException({
          message: expanded.problems.map((p) => p.message).join('; '),
          details: [...byField.entries()].map(([field, problems]) => ({ field, problems })),
        });
      }
      serials = expanded.serials;
    }
    if (await this.em.count(Lot, { code: dto.code })) {
      throw new ConflictException({ message: `Lot code ${dto.code} is already used.`, details: { code: 'lot_code_taken' } });
    }
    const id = await this.em.transactional(async (em) => {
      let lot: Lot;
      if (serials) {
        const taken = await takenSerials(em, serials);
        if (taken.size) {
          throw new ConflictException({
            message: `${taken.size === 1 ? 'A serial is' : `${taken.size} serials are`} already registered: ${describeTaken(taken)}. Choose serials no other lot holds.`,
            details: { code: 'serial_taken', serial: [...taken.keys()].sort()[0], count: taken.size },
          });
        }
        lot = createLotWithSerials(em, { code: dto.code, product, plannedQuantity: dto.plannedQuantity, serials });
      } else {
        const registered = await registerLot(em, { code: dto.code, product, plannedQuantity: dto.plannedQuantity, firstSequence: dto.firstSequence, at: new Date() });
        lot = registered.lot;
        serials = registered.serials;
      }
      await em.flush();
      await this.audit.record(
        {
          actor: actor.id,
          action: 'lot.created',
          entityType: 'lot',
          entityId: lot.id,
          after: { code: lot.code, productId: product.id, plannedQuantity: lot.plannedQuantity, state: lot.state, firstSerial: serials[0], lastSerial: serials[serials.length - 1], serialsGiven: input?.kind ?? 'next_free' },
        },
        em,
      );
      return lot.id;
    });
    return this.get(id);
  }

  /** Units per state for each lot id. */
  async unitCounts(lotIds: number[]): Promise<Map<number, UnitCountsDto>> {
    const out = new Map<number, UnitCountsDto>();
    if (lotIds.length === 0) return out;
    const rows = await this.em
      .getConnection()
      .execute<{ lot_id: number; state: UnitState; n: number }[]>(
        `select lot_id, state, count(*) as n from ${this.em.getMetadata(Unit).tableName} where lot_id in (${lotIds.map(() => '?').join(',')}) group by lot_id, state`,
        lotIds,
      );
    for (const id of lotIds) out.set(id, emptyCounts());
    for (const r of rows) {
      const c = out.get(r.lot_id)!;
      c[r.state] = Number(r.n);
      c.total += Number(r.n);
    }
    return out;
  }

  /** The lots among `lotIds` that have a certificate of conformance. */
  private async certified(lotIds: number[]): Promise<Set<number>> {
    if (lotIds.length === 0) return new Set();
    const rows = await this.em
      .getConnection()
      .execute<{ lot_id: number }[]>(`select lot_id from ${this.em.getMetadata(LotCertificate).tableName} where lot_id in (${lotIds.map(() => '?').join(',')})`, lotIds);
    return new Set(rows.map((r) => r.lot_id));
  }
}
