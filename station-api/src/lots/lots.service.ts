import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { ProductsService } from '../products/products.service';
import { Unit, UnitState } from '../units/unit.entity';
import type { CreateLotDto, LotDetailDto, LotDto, LotQueryDto, UnitCountsDto } from './dto/lot.dto';
import { Lot } from './lot.entity';
import { registerLot } from './lot-registration';

const emptyCounts = (): UnitCountsDto => ({ untested: 0, passed: 0, failed: 0, in_repair: 0, scrapped: 0, total: 0 });

export function toLotDto(lot: Lot, counts: UnitCountsDto = emptyCounts()): LotDto {
  return {
    id: lot.id,
    code: lot.code,
    state: lot.state,
    holdReason: lot.holdReason ?? null,
    plannedQuantity: lot.plannedQuantity,
    product: { id: lot.product.id, partNumber: lot.product.partNumber, name: lot.product.name },
    createdAt: lot.createdAt.toISOString(),
    unitCounts: counts,
  };
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
    const lots = await this.em.find(Lot, where, { populate: ['product'], orderBy: { createdAt: 'desc', id: 'desc' } });
    const counts = await this.unitCounts(lots.map((l) => l.id));
    return lots.map((l) => toLotDto(l, counts.get(l.id)));
  }

  async getEntity(id: number): Promise<Lot> {
    const lot = await this.em.findOne(Lot, { id }, { populate: ['product'] });
    if (!lot) throw new NotFoundException({ message: `There is no lot with id ${id}.`, details: { code: 'unknown_lot' } });
    return lot;
  }

  async get(id: number): Promise<LotDetailDto> {
    const lot = await this.getEntity(id);
    const counts = await this.unitCounts([lot.id]);
    const [range] = await this.em
      .getConnection()
      .execute<{ first: string | null; last: string | null }[]>('select min(serial) as first, max(serial) as last from units where lot_id = ?', [lot.id]);
    return { ...toLotDto(lot, counts.get(lot.id)), firstSerial: range?.first ?? null, lastSerial: range?.last ?? null };
  }

  /** Creates the lot and registers all its units in one transaction. */
  async create(dto: CreateLotDto, actor: AuthUser): Promise<LotDetailDto> {
    const product = await this.products.getEntity(dto.productId);
    if (!product.active) {
      throw new ConflictException({ message: `Product ${product.partNumber} is inactive; reactivate it before opening a lot.`, details: { code: 'product_inactive' } });
    }
    if (await this.em.count(Lot, { code: dto.code })) {
      throw new ConflictException({ message: `Lot code ${dto.code} is already used.`, details: { code: 'lot_code_taken' } });
    }
    const id = await this.em.transactional(async (em) => {
      const { lot, serials } = await registerLot(em, { code: dto.code, product, plannedQuantity: dto.plannedQuantity, firstSequence: dto.firstSequence, at: new Date() });
      await em.flush();
      await this.audit.record(
        {
          actor: actor.id,
          action: 'lot.created',
          entityType: 'lot',
          entityId: lot.id,
          after: { code: lot.code, productId: product.id, plannedQuantity: lot.plannedQuantity, state: lot.state, firstSerial: serials[0], lastSerial: serials[serials.length - 1] },
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
}
