import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { Unit } from '../units/unit.entity';
import type { CreateProductDto, ProductDto, UpdateProductDto } from './dto/product.dto';
import { Product } from './product.entity';
import { ratingProblems } from './product-ratings';

export function toProductDto(p: Product): ProductDto {
  return {
    id: p.id,
    partNumber: p.partNumber,
    name: p.name,
    family: p.family,
    vinMinV: p.vinMinV,
    vinNomV: p.vinNomV,
    vinMaxV: p.vinMaxV,
    voutNomV: p.voutNomV,
    ioutRatedA: p.ioutRatedA,
    serialPattern: p.serialPattern,
    active: p.active,
  };
}

/** The fields a PATCH actually sets (absent ones must not overwrite stored values). */
function definedOnly<T extends object>(dto: T): Partial<T> {
  return Object.fromEntries(Object.entries(dto).filter(([, v]) => v !== undefined)) as Partial<T>;
}

function assertRatings(p: Product | CreateProductDto): void {
  const details = ratingProblems(p);
  if (details.length) throw new BadRequestException({ message: details.flatMap((d) => d.problems).join('; '), details });
}

@Injectable()
export class ProductsService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
  ) {}

  async list(): Promise<ProductDto[]> {
    return (await this.em.find(Product, {}, { orderBy: { partNumber: 'asc' } })).map(toProductDto);
  }

  async getEntity(id: number): Promise<Product> {
    const p = await this.em.findOne(Product, { id });
    if (!p) throw new NotFoundException({ message: `There is no product with id ${id}.`, details: { code: 'unknown_product' } });
    return p;
  }

  async get(id: number): Promise<ProductDto> {
    return toProductDto(await this.getEntity(id));
  }

  async create(dto: CreateProductDto, actor: AuthUser): Promise<ProductDto> {
    assertRatings(dto);
    if (await this.em.count(Product, { partNumber: dto.partNumber })) {
      throw new ConflictException({ message: `Part number ${dto.partNumber} already exists.`, details: { code: 'part_number_taken' } });
    }
    return this.em.transactional(async (em) => {
      const p = em.create(Product, { ...dto, active: true }, { partial: true });
      await em.flush();
      await this.audit.record({ actor: actor.id, action: 'product.created', entityType: 'product', entityId: p.id, after: toProductDto(p) }, em);
      return toProductDto(p);
    });
  }

  async update(id: number, dto: UpdateProductDto, actor: AuthUser): Promise<ProductDto> {
    const p = await this.getEntity(id);
    const before = toProductDto(p);
    if (dto.serialPattern !== undefined && dto.serialPattern !== p.serialPattern && (await this.em.count(Unit, { product: p }))) {
      throw new ConflictException({
        message: `Units of ${p.partNumber} are already registered under the current serial pattern, so it cannot change. Create a new product instead.`,
        details: { code: 'serial_pattern_in_use' },
      });
    }
    this.em.assign(p, definedOnly(dto));
    assertRatings(p);
    const after = toProductDto(p);
    // a PATCH that sets what is already there is not worth an audit line
    if (JSON.stringify(before) !== JSON.stringify(after)) {
      await this.audit.record({ actor: actor.id, action: 'product.updated', entityType: 'product', entityId: p.id, before, after }, this.em);
    }
    await this.em.flush();
    return toProductDto(p);
  }
}
