import type { EntityManager as AnyEntityManager } from '@mikro-orm/core';
import { EntityManager, RequestContext } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';
import type {
  CreatePlanVersionDto,
  PlanDetailDto,
  PlanSummaryDto,
  PlanTextValidationDto,
  PlanVersionDto,
  PlanVersionSummaryDto,
  UserRefDto,
} from './dto/plan.dto';
import { parsePlanText, stepsChecksum, validatePlanSteps, type PlanProduct } from './plan-file';
import { PlanVersion, PlanVersionState } from './plan-version.entity';
import { TestPlan } from './test-plan.entity';

function userRef(u: User | undefined): UserRefDto | null {
  return u ? { id: u.id, username: u.username, displayName: u.displayName } : null;
}

export function toPlanVersionSummaryDto(v: PlanVersion): PlanVersionSummaryDto {
  return {
    id: v.id,
    planId: v.plan.id,
    version: v.version,
    state: v.state,
    reason: v.reason,
    stopAtFirstFailure: v.stopAtFirstFailure,
    maxAttempts: v.maxAttempts,
    checksum: v.checksum,
    sourceFile: v.sourceFile ?? null,
    stepCount: v.steps.length,
    createdAt: v.createdAt.toISOString(),
    createdBy: userRef(v.createdBy),
    releasedAt: v.releasedAt ? v.releasedAt.toISOString() : null,
    releasedBy: userRef(v.releasedBy),
    submittedAt: v.submittedAt ? v.submittedAt.toISOString() : null,
    submittedBy: userRef(v.submittedBy),
    changeReason: v.changeReason ?? null,
    retiredAt: v.retiredAt ? v.retiredAt.toISOString() : null,
    retiredBy: userRef(v.retiredBy),
    retireReason: v.retireReason ?? null,
    stage: versionStage(v),
  };
}

/** The lifecycle stage a person reads: the stored state refined by submission and retirement. */
export function versionStage(v: PlanVersion): PlanVersionSummaryDto['stage'] {
  if (v.retiredAt) return 'retired';
  if (v.state === PlanVersionState.Draft) return v.submittedAt ? 'submitted' : 'draft';
  return v.state;
}

export function toPlanVersionDto(v: PlanVersion): PlanVersionDto {
  const p = v.plan;
  return {
    ...toPlanVersionSummaryDto(v),
    plan: { id: p.id, code: p.code, name: p.name, product: { id: p.product.id, partNumber: p.product.partNumber, name: p.product.name } },
    steps: v.steps,
  };
}

function toPlanSummaryDto(p: TestPlan, versions: PlanVersion[]): PlanSummaryDto {
  const released = versions.filter((v) => v.state === PlanVersionState.Released && !v.retiredAt).sort((a, b) => b.version - a.version)[0];
  return {
    id: p.id,
    code: p.code,
    name: p.name,
    product: { id: p.product.id, partNumber: p.product.partNumber, name: p.product.name },
    releasedVersion: released ? toPlanVersionSummaryDto(released) : null,
    versionCount: versions.length,
  };
}

export function planProduct(p: Product): PlanProduct {
  return { partNumber: p.partNumber, vinMinV: p.vinMinV, vinNomV: p.vinNomV, vinMaxV: p.vinMaxV, voutNomV: p.voutNomV, ioutRatedA: p.ioutRatedA };
}

/** Turns step issues into the API's validation-error shape, `details: [{field, problems}]`. */
export function stepsRefusal(issues: { path: string; message: string }[]): BadRequestException {
  const byField = new Map<string, string[]>();
  for (const i of issues) byField.set(i.path, [...(byField.get(i.path) ?? []), i.message]);
  const details = [...byField].map(([field, problems]) => ({ field, problems }));
  return new BadRequestException({ message: issues.map((i) => `${i.path}: ${i.message}`).join('; '), details });
}

/**
 * Test plans and their versions. A version is created as a draft and becomes the one stations run when an
 * engineer releases it; the version it replaces becomes superseded. A released or superseded version never
 * changes (the entity refuses it too, see PlanVersion).
 */
@Injectable()
export class PlansService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
  ) {}

  async list(): Promise<PlanSummaryDto[]> {
    const plans = await this.em.find(TestPlan, {}, { populate: ['product', 'versions'], orderBy: { code: 'asc' } });
    return plans.map((p) => toPlanSummaryDto(p, p.versions.getItems()));
  }

  async get(id: number): Promise<PlanDetailDto> {
    const plan = await this.planEntity(id);
    const versions = await this.em.find(PlanVersion, { plan }, { populate: ['createdBy', 'releasedBy', 'submittedBy', 'retiredBy'], orderBy: { version: 'desc' } });
    return { ...toPlanSummaryDto(plan, versions), versions: versions.map(toPlanVersionSummaryDto) };
  }

  async getVersion(id: number): Promise<PlanVersionDto> {
    return toPlanVersionDto(await this.versionEntity(id));
  }

  /**
   * The version stations run for a product: its newest released plan version, with `plan` populated.
   * Callers outside an HTTP request (the run engine) pass their own EntityManager fork.
   * @returns the version, or null when the product has no released plan
   */
  async releasedVersionForProduct(productId: number, em?: AnyEntityManager): Promise<PlanVersion | null> {
    const target: AnyEntityManager = em ?? (RequestContext.getEntityManager() ? this.em : this.em.fork());
    return target.findOne(
      PlanVersion,
      { plan: { product: productId }, state: PlanVersionState.Released, retiredAt: null },
      { orderBy: { version: 'desc' }, populate: ['plan', 'plan.product'] },
    );
  }

  /** Creates a draft version after checking its steps as strictly as a plan file. */
  async createDraft(planId: number, dto: CreatePlanVersionDto, actor: AuthUser): Promise<PlanVersionDto> {
    const plan = await this.planEntity(planId);
    const { steps, issues } = validatePlanSteps(dto.steps, planProduct(plan.product));
    if (!steps) throw stepsRefusal(issues);
    return this.em.transactional(async (em) => {
      const last = await em.findOne(PlanVersion, { plan: plan.id }, { orderBy: { version: 'desc' } });
      const version = em.create(
        PlanVersion,
        {
          plan: em.getReference(TestPlan, plan.id),
          version: (last?.version ?? 0) + 1,
          state: PlanVersionState.Draft,
          reason: dto.reason,
          stopAtFirstFailure: dto.stopAtFirstFailure,
          maxAttempts: dto.maxAttempts,
          steps,
          checksum: stepsChecksum(steps),
          createdBy: em.getReference(User, actor.id),
        },
        { partial: true },
      );
      await em.flush();
      await this.audit.record(
        {
          actor: actor.id,
          action: 'plan_version.created',
          entityType: 'plan_version',
          entityId: version.id,
          reason: dto.reason,
          after: { plan: plan.code, version: version.version, checksum: version.checksum, state: version.state },
        },
        em,
      );
      await em.flush();
      await em.populate(version, ['plan', 'plan.product', 'createdBy', 'releasedBy']);
      return toPlanVersionDto(version);
    });
  }

  /** Checks the YAML text of a plan file; the product is looked up by the part number in its header. */
  async validateText(text: string): Promise<PlanTextValidationDto> {
    const products = (await this.em.find(Product, {})).map(planProduct);
    const { plan, issues } = parsePlanText(text, '(text)', { products });
    return {
      valid: !!plan,
      errors: issues.map((i) => ({ path: i.path, line: i.line, column: i.column, message: i.message })),
      ...(plan
        ? { plan: { planCode: plan.header.planCode, partNumber: plan.header.partNumber, revision: plan.header.revision, stepCount: plan.steps.length, checksum: plan.checksum } }
        : {}),
    };
  }

  async planEntity(id: number): Promise<TestPlan> {
    const plan = await this.em.findOne(TestPlan, { id }, { populate: ['product'] });
    if (!plan) throw new NotFoundException({ message: `There is no test plan with id ${id}.`, details: { code: 'unknown_plan' } });
    return plan;
  }

  async versionEntity(id: number): Promise<PlanVersion> {
    const v = await this.em.findOne(PlanVersion, { id }, { populate: ['plan', 'plan.product', 'createdBy', 'releasedBy', 'submittedBy', 'retiredBy'] });
    if (!v) throw new NotFoundException({ message: `There is no plan version with id ${id}.`, details: { code: 'unknown_plan_version' } });
    return v;
  }
}
