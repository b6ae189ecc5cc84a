import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { PlansService } from '../plans/plans.service';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';
import type { CreateHoldRuleDto, HoldRuleDto, HoldRuleQueryDto, QuantityChoiceDto, UpdateHoldRuleDto } from './dto/hold-rule.dto';
import { HoldRule, HoldRuleKind } from './hold-rule.entity';
import { checkRuleFields } from './hold-rule-checks';
import { toHoldRuleDto } from './hold-views';

/** The rule's own fields, for the audit trail: its view without who made it and when. */
function ruleState(r: HoldRule): Record<string, unknown> {
  const { id: _id, partNumber: _part, createdByName: _by, createdAt: _at, switchedOffAt: _off, ...state } = toHoldRuleDto(r);
  return state;
}

/** Hold rules per product: list, add (checked against the product's released plan), switch off and on. */
@Injectable()
export class HoldRulesService {
  constructor(
    private readonly em: EntityManager,
    private readonly plans: PlansService,
    private readonly audit: AuditService,
  ) {}

  async list(q: HoldRuleQueryDto): Promise<HoldRuleDto[]> {
    const rules = await this.em.find(HoldRule, q.productId ? { product: q.productId } : {}, {
      populate: ['product', 'createdBy'],
      orderBy: { active: 'desc', id: 'asc' },
    });
    return rules.map(toHoldRuleDto);
  }

  /** The quantities of the product's released plan a rule can watch, in plan order. */
  async quantities(productId: number): Promise<QuantityChoiceDto[]> {
    await this.product(productId);
    const plan = await this.plans.releasedVersionForProduct(productId, this.em);
    if (!plan) return [];
    return plan.steps.flatMap((s) =>
      s.limits.map((l) => ({ stepKey: s.key, stepName: s.name, quantity: l.key, name: l.name, unit: l.unit, hasLimits: l.low !== undefined || l.high !== undefined })),
    );
  }

  async create(dto: CreateHoldRuleDto, actor: AuthUser): Promise<HoldRuleDto> {
    const product = await this.product(dto.productId);
    const plan = dto.kind === HoldRuleKind.Cpk || dto.kind === HoldRuleKind.RunRule ? await this.plans.releasedVersionForProduct(product.id, this.em) : null;
    const { productId: _p, ...fields } = dto;
    const problems = checkRuleFields(fields as never, plan?.steps ?? null, product.partNumber);
    if (problems.length > 0) {
      throw new BadRequestException({ message: problems.flatMap((p) => p.problems).join('; '), details: problems });
    }
    const rule = this.em.create(
      HoldRule,
      {
        product,
        kind: dto.kind,
        windowUnits: dto.windowUnits,
        minFpyPct: dto.minFpyPct,
        minCpk: dto.minCpk,
        stepKey: dto.stepKey,
        quantity: dto.quantity,
        ruleSet: dto.kind === HoldRuleKind.RunRule ? (dto.ruleSet ?? 'western-electric') : undefined,
        failuresInRow: dto.failuresInRow,
        active: true,
        createdBy: this.em.getReference(User, actor.id),
      },
      { partial: true },
    );
    await this.em.flush();
    await this.audit.record({ actor: actor.id, action: 'hold_rule.created', entityType: 'hold_rule', entityId: rule.id, after: { ...ruleState(rule), partNumber: product.partNumber } }, this.em);
    await this.em.flush();
    await this.em.populate(rule, ['createdBy']);
    return toHoldRuleDto(rule);
  }

  async update(id: number, dto: UpdateHoldRuleDto, actor: AuthUser): Promise<HoldRuleDto> {
    const rule = await this.em.findOne(HoldRule, { id }, { populate: ['product', 'createdBy'] });
    if (!rule) throw new NotFoundException(`There is no hold rule with id ${id}.`);
    if (rule.active !== dto.active) {
      const before = ruleState(rule);
      rule.active = dto.active;
      rule.switchedOffAt = dto.active ? undefined : new Date();
      rule.switchedOffBy = dto.active ? undefined : this.em.getReference(User, actor.id);
      await this.audit.record(
        { actor: actor.id, action: dto.active ? 'hold_rule.switched_on' : 'hold_rule.switched_off', entityType: 'hold_rule', entityId: rule.id, before, after: ruleState(rule) },
        this.em,
      );
      await this.em.flush();
    }
    return toHoldRuleDto(rule);
  }

  private async product(id: number): Promise<Product> {
    const product = await this.em.findOne(Product, { id });
    if (!product) {
      throw new BadRequestException({ message: `productId: there is no product with id ${id}`, details: [{ field: 'productId', problems: [`there is no product with id ${id}`] }] });
    }
    return product;
  }
}
