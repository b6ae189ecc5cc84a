import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, ConflictException, ForbiddenException, Injectable } from '@nestjs/common';
import { AuditEvent } from '../audit/audit-event.entity';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { User } from '../users/user.entity';
import type { PlanVersionDto } from './dto/plan.dto';
import type { DecisionRule, LimitSpec } from './plan-definition';
import { parseLimitKey } from './step-kinds/limit-keys';
import { implausibility, shown } from './step-kinds/ranges';
import { STEP_KIND_DEFS } from './step-kinds/registry';
import type { ChangeReasonDto, PlanComparisonDto, UpdateDraftDto } from './dto/plan-lifecycle.dto';
import { comparePlans } from './plan-compare';
import { stepsChecksum, validatePlanSteps } from './plan-file';
import { PlanVersion, PlanVersionState } from './plan-version.entity';
import { planProduct, PlansService, stepsRefusal, toPlanVersionDto, versionStage } from './plans.service';
import { TestPlan } from './test-plan.entity';

/** One limit of one step of a draft, with its new bounds (and optionally uncertainty and rule). */
export interface LimitChange {
  stepKey: string;
  limitKey: string;
  low?: number;
  high?: number;
  uncertainty?: number;
  rule?: DecisionRule;
}

const POPULATE = ['plan', 'plan.product', 'createdBy', 'releasedBy', 'submittedBy', 'retiredBy'] as const;

/** 409 for any change to a version that is not an open draft. */
function notDraft(v: PlanVersion, what: string): ConflictException {
  const stage = versionStage(v);
  return new ConflictException({
    message: `Version ${v.version} of ${v.plan.code} is ${stage}; only a draft can ${what}. A released version never changes: start a new draft from it instead.`,
    details: { code: 'not_draft', state: v.state, stage },
  });
}

/** A short, plain summary of a version for the audit trail. */
function auditView(v: PlanVersion): Record<string, unknown> {
  return { plan: v.plan.code, version: v.version, stage: versionStage(v), checksum: v.checksum, stepCount: v.steps.length, stopAtFirstFailure: v.stopAtFirstFailure, maxAttempts: v.maxAttempts };
}

/**
 * The life of a plan version: a draft is edited, submitted for release with a change reason, and released by a
 * second engineer (nobody approves a change they made). A released version never changes; it is superseded by
 * the next release or retired, and both keep it with its history. A new draft can start from any version.
 * Every step is written to the audit trail with who, when, what and why.
 */
@Injectable()
export class PlanVersionsService {
  constructor(
    private readonly em: EntityManager,
    private readonly plans: PlansService,
    private readonly audit: AuditService,
  ) {}

  private async load(id: number): Promise<PlanVersion> {
    const v = await this.plans.versionEntity(id);
    await this.em.populate(v, ['submittedBy', 'retiredBy']);
    return v;
  }

  private async answer(v: PlanVersion): Promise<PlanVersionDto> {
    await this.em.populate(v, POPULATE);
    return toPlanVersionDto(v);
  }

  /** Edits a draft; an edit withdraws a submission, so the approver always reviews what will be released. */
  async update(id: number, dto: UpdateDraftDto, actor: AuthUser, options: { auditReason?: string } = {}): Promise<PlanVersionDto> {
    const v = await this.load(id);
    if (v.state !== PlanVersionState.Draft) throw notDraft(v, 'be edited');
    if (dto.steps === undefined && dto.stopAtFirstFailure === undefined && dto.maxAttempts === undefined && dto.reason === undefined) {
      throw new BadRequestException({ message: 'Nothing to change: send steps, stopAtFirstFailure, maxAttempts or reason.', details: { code: 'empty_change' } });
    }
    const before = auditView(v);
    const beforeSteps = v.steps;
    if (dto.steps !== undefined) {
      const { steps, issues } = validatePlanSteps(dto.steps, planProduct(v.plan.product));
      if (!steps) throw stepsRefusal(issues);
      v.steps = steps;
      v.checksum = stepsChecksum(steps);
    }
    if (dto.stopAtFirstFailure !== undefined) v.stopAtFirstFailure = dto.stopAtFirstFailure;
    if (dto.maxAttempts !== undefined) v.maxAttempts = dto.maxAttempts;
    if (dto.reason !== undefined) v.reason = dto.reason;
    const wasSubmitted = !!v.submittedAt;
    v.submittedAt = undefined;
    v.submittedBy = undefined;
    const diff = comparePlans({ ...v, steps: beforeSteps, stopAtFirstFailure: before.stopAtFirstFailure as boolean, maxAttempts: before.maxAttempts as number }, v);
    await this.audit.record(
      {
        actor: actor.id,
        action: 'plan_version.edited',
        entityType: 'plan_version',
        entityId: v.id,
        reason: dto.reason ?? options.auditReason ?? (wasSubmitted ? 'draft edited after submission; submission withdrawn' : undefined),
        before,
        after: { ...auditView(v), changes: [...diff.changed.flatMap((c) => c.changes.map((x) => ({ step: c.key, ...x }))), ...diff.settings], added: diff.added.map((a) => a.key), removed: diff.removed.map((r) => r.key), submissionWithdrawn: wasSubmitted },
      },
      this.em,
    );
    await this.em.flush();
    return this.answer(v);
  }

  /**
   * Sets the bounds of one limit of a draft (limits derived from characterization data). The new bounds must lie
   * inside the quantity's physical range; then the steps are checked and audited exactly as an editor's save
   * (`plan_version.edited`, with `reason`), and the version's own reason stays. 409 for a version that is not a draft.
   * The limit becomes exactly [low, high]: a bound left out is removed (a one-sided limit).
   */
  async setLimit(id: number, change: LimitChange, reason: string, actor: AuthUser): Promise<{ version: PlanVersionDto; before: LimitSpec; after: LimitSpec }> {
    const v = await this.load(id);
    if (v.state !== PlanVersionState.Draft) throw notDraft(v, 'be edited');
    const refuse = (field: string, message: string) => new BadRequestException({ message, details: [{ field, problems: [message] }] });
    if (change.low === undefined && change.high === undefined) throw refuse('low', 'Give a low limit, a high limit or both.');
    const steps = structuredClone(v.steps);
    const step = steps.find((s) => s.key === change.stepKey);
    if (!step) throw refuse('stepKey', `Version ${v.version} of ${v.plan.code} has no step "${change.stepKey}"; its steps are ${steps.map((s) => s.key).join(', ')}.`);
    const limit = step.limits.find((l) => l.key === change.limitKey);
    if (!limit) throw refuse('limitKey', `Step "${step.key}" has no limit "${change.limitKey}"; its limits are ${step.limits.map((l) => l.key).join(', ')}.`);
    const def = STEP_KIND_DEFS[step.kind].quantities.find((q) => q.base === parseLimitKey(limit.key).base);
    const product = planProduct(v.plan.product);
    for (const [field, x] of [['low', change.low], ['high', change.high]] as const) {
      if (x === undefined || !def) continue;
      if (implausibility(def, limit.key, x, product, step.params)) {
        throw refuse(field, `${field} ${shown(x)} ${def.unit} lies outside the physical range of ${limit.key} (${def.range.text}: ${def.range.law}).`);
      }
    }
    const before = { ...limit };
    delete limit.low;
    delete limit.high;
    if (change.low !== undefined) limit.low = change.low;
    if (change.high !== undefined) limit.high = change.high;
    if (change.uncertainty !== undefined) limit.uncertainty = change.uncertainty;
    if (change.rule !== undefined) limit.rule = change.rule;
    const version = await this.update(id, { steps }, actor, { auditReason: reason });
    const after = version.steps.find((s) => s.key === step.key)!.limits.find((l) => l.key === limit.key)!;
    return { version, before, after };
  }

  /** Puts a draft forward for release with the change reason the approver will read. */
  async submit(id: number, dto: ChangeReasonDto, actor: AuthUser): Promise<PlanVersionDto> {
    const v = await this.load(id);
    if (v.state !== PlanVersionState.Draft) throw notDraft(v, 'be submitted for release');
    if (v.submittedAt) {
      throw new ConflictException({ message: `Version ${v.version} of ${v.plan.code} is already submitted for release; a second engineer releases it now.`, details: { code: 'already_submitted' } });
    }
    const { issues } = validatePlanSteps(v.steps, planProduct(v.plan.product));
    if (issues.length > 0) throw stepsRefusal(issues);
    v.submittedAt = new Date();
    v.submittedBy = this.em.getReference(User, actor.id);
    v.changeReason = dto.reason;
    await this.audit.record({ actor: actor.id, action: 'plan_version.submitted', entityType: 'plan_version', entityId: v.id, reason: dto.reason, after: auditView(v) }, this.em);
    await this.em.flush();
    return this.answer(v);
  }

  /**
   * Releases a submitted draft; the plan's released version becomes superseded. The releasing engineer must not
   * be the one who created, edited or submitted it (four-eyes rule).
   */
  async release(id: number, dto: ChangeReasonDto, actor: AuthUser): Promise<PlanVersionDto> {
    const v = await this.load(id);
    if (v.state !== PlanVersionState.Draft) throw notDraft(v, 'be released');
    if (!v.submittedAt) {
      throw new ConflictException({ message: `Version ${v.version} of ${v.plan.code} has not been submitted for release; submit it with a change reason first.`, details: { code: 'not_submitted' } });
    }
    const edited = await this.em.count(AuditEvent, { action: 'plan_version.edited', entityType: 'plan_version', entityId: String(v.id), actor: actor.id });
    const own = v.createdBy?.id === actor.id || v.submittedBy?.id === actor.id || edited > 0;
    if (own) {
      throw new ForbiddenException({
        message: `You worked on version ${v.version} of ${v.plan.code}, so you cannot approve it: nobody releases their own change. Ask another engineer to review and release it.`,
        details: { code: 'own_change' },
      });
    }
    // the product's ratings may have changed since the draft was written
    const { issues } = validatePlanSteps(v.steps, planProduct(v.plan.product));
    if (issues.length > 0) throw stepsRefusal(issues);

    return this.em.transactional(async (em) => {
      const draft = await em.findOneOrFail(PlanVersion, { id: v.id }, { populate: POPULATE });
      const previous = await em.find(PlanVersion, { plan: draft.plan.id, state: PlanVersionState.Released });
      for (const p of previous) p.state = PlanVersionState.Superseded;
      draft.state = PlanVersionState.Released;
      draft.releasedAt = new Date();
      draft.releasedBy = em.getReference(User, actor.id);
      await this.audit.record(
        {
          actor: actor.id,
          action: 'plan_version.released',
          entityType: 'plan_version',
          entityId: draft.id,
          reason: dto.reason,
          before: { plan: draft.plan.code, releasedVersions: previous.map((p) => p.version), changeReason: draft.changeReason },
          after: { plan: draft.plan.code, version: draft.version, checksum: draft.checksum, superseded: previous.map((p) => p.version) },
        },
        em,
      );
      await em.flush();
      await em.populate(draft, POPULATE);
      return toPlanVersionDto(draft);
    });
  }

  /** Retires a released or superseded version: stations stop running it, its history and runs stay. */
  async retire(id: number, dto: ChangeReasonDto, actor: AuthUser): Promise<PlanVersionDto> {
    const v = await this.load(id);
    if (v.state === PlanVersionState.Draft) {
      throw new ConflictException({ message: `Version ${v.version} of ${v.plan.code} is a draft; a draft is discarded, not retired.`, details: { code: 'is_draft' } });
    }
    if (v.retiredAt) throw new ConflictException({ message: `Version ${v.version} of ${v.plan.code} is already retired.`, details: { code: 'already_retired' } });
    v.retiredAt = new Date();
    v.retiredBy = this.em.getReference(User, actor.id);
    v.retireReason = dto.reason;
    await this.audit.record({ actor: actor.id, action: 'plan_version.retired', entityType: 'plan_version', entityId: v.id, reason: dto.reason, before: { state: v.state }, after: auditView(v) }, this.em);
    await this.em.flush();
    return this.answer(v);
  }

  /** Discards a draft that was never released (no run can refer to it); the audit trail keeps what it held. */
  async discard(id: number, dto: ChangeReasonDto, actor: AuthUser): Promise<void> {
    const v = await this.load(id);
    if (v.state !== PlanVersionState.Draft) throw notDraft(v, 'be discarded');
    await this.audit.record({ actor: actor.id, action: 'plan_version.discarded', entityType: 'plan_version', entityId: v.id, reason: dto.reason, before: { ...auditView(v), steps: v.steps } }, this.em);
    this.em.remove(v);
    await this.em.flush();
  }

  /** Starts a new draft from any version of the plan (its steps and settings copied). */
  async draftFrom(id: number, dto: ChangeReasonDto, actor: AuthUser): Promise<PlanVersionDto> {
    const source = await this.load(id);
    return this.em.transactional(async (em) => {
      const last = await em.findOne(PlanVersion, { plan: source.plan.id }, { orderBy: { version: 'desc' } });
      const draft = em.create(
        PlanVersion,
        {
          plan: em.getReference(TestPlan, source.plan.id),
          version: (last?.version ?? 0) + 1,
          state: PlanVersionState.Draft,
          reason: dto.reason,
          stopAtFirstFailure: source.stopAtFirstFailure,
          maxAttempts: source.maxAttempts,
          steps: structuredClone(source.steps),
          checksum: source.checksum,
          createdBy: em.getReference(User, actor.id),
        },
        { partial: true },
      );
      await em.flush();
      await this.audit.record(
        { actor: actor.id, action: 'plan_version.created', entityType: 'plan_version', entityId: draft.id, reason: dto.reason, after: { ...auditView(draft), startedFrom: source.version } },
        em,
      );
      await em.flush();
      await em.populate(draft, POPULATE);
      return toPlanVersionDto(draft);
    });
  }

  /** Differences from version `fromId` to version `toId` (any two versions of the same plan). */
  async compare(fromId: number, toId: number): Promise<PlanComparisonDto> {
    const a = await this.load(fromId);
    const b = await this.load(toId);
    if (a.plan.id !== b.plan.id) {
      throw new BadRequestException({ message: `Versions ${fromId} and ${toId} belong to different plans (${a.plan.code}, ${b.plan.code}); compare versions of one plan.`, details: { code: 'different_plans' } });
    }
    return { fromVersionId: a.id, toVersionId: b.id, fromVersion: a.version, toVersion: b.version, ...comparePlans(a, b) };
  }
}
