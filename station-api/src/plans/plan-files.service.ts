import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';
import type { PlanVersionDto } from './dto/plan.dto';
import { planFileText } from './plan-export';
import { parsePlanText, type PlanIssue } from './plan-file';
import { PlanVersion, PlanVersionState } from './plan-version.entity';
import { planProduct, PlansService, toPlanVersionDto } from './plans.service';
import { TestPlan } from './test-plan.entity';

/** Largest plan file accepted by upload; the demo plans are about 5 kB. */
export const MAX_PLAN_FILE_BYTES = 512 * 1024;

/** 400 listing every problem with its field and line; nothing is written. */
function fileRefusal(name: string, issues: Pick<PlanIssue, 'path' | 'line' | 'column' | 'message'>[]): BadRequestException {
  return new BadRequestException({
    message: `${name} was not imported, nothing changed: ` + issues.map((i) => `line ${i.line}, ${i.path}: ${i.message}`).join('; '),
    details: issues.map((i) => ({ field: i.path, line: i.line, column: i.column, message: i.message })),
  });
}

/** Plan files in and out: an upload becomes a draft of its plan; any version can be written back as a file. */
@Injectable()
export class PlanFilesService {
  constructor(
    private readonly em: EntityManager,
    private readonly plans: PlansService,
    private readonly audit: AuditService,
  ) {}

  /**
   * Imports an uploaded plan file as a new draft of the plan its header names. A file with any problem is
   * refused whole with every problem (field, line, column) and changes nothing.
   */
  async importFile(file: { originalname: string; buffer: Buffer; size: number } | undefined, actor: AuthUser): Promise<PlanVersionDto> {
    if (!file) throw new BadRequestException({ message: 'No file: send the plan file as multipart form field "file".', details: [{ field: 'file', line: 0, column: 0, message: 'missing' }] });
    const name = file.originalname || 'plan file';
    if (file.size === 0) throw fileRefusal(name, [{ path: '(file)', line: 0, column: 0, message: 'the file is empty' }]);
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(file.buffer);
    } catch {
      throw fileRefusal(name, [{ path: '(file)', line: 0, column: 0, message: 'the file is not UTF-8 text; save it as UTF-8 and upload it again' }]);
    }
    const products = await this.em.find(Product, {});
    const { plan: parsed, issues } = parsePlanText(text, name, { products: products.map(planProduct) });
    if (!parsed) throw fileRefusal(name, issues);

    const plan = await this.em.findOne(TestPlan, { code: parsed.header.planCode }, { populate: ['product'] });
    if (!plan) {
      throw fileRefusal(name, [{ path: 'header.planCode', line: lineOf(text, 'planCode'), column: 0, message: `there is no plan ${parsed.header.planCode}; import a file of an existing plan` }]);
    }
    if (plan.product.partNumber !== parsed.header.partNumber) {
      throw fileRefusal(name, [{ path: 'header.partNumber', line: lineOf(text, 'partNumber'), column: 0, message: `plan ${plan.code} tests ${plan.product.partNumber}, not ${parsed.header.partNumber}` }]);
    }
    return this.em.transactional(async (em) => {
      const last = await em.findOne(PlanVersion, { plan: plan.id }, { orderBy: { version: 'desc' } });
      const draft = em.create(
        PlanVersion,
        {
          plan: em.getReference(TestPlan, plan.id),
          version: (last?.version ?? 0) + 1,
          state: PlanVersionState.Draft,
          reason: parsed.header.reason,
          stopAtFirstFailure: parsed.header.stopAtFirstFailure,
          maxAttempts: parsed.header.maxAttempts,
          steps: parsed.steps,
          checksum: parsed.checksum,
          sourceFile: name,
          author: parsed.header.author,
          fileRevision: parsed.header.revision,
          createdBy: em.getReference(User, actor.id),
        },
        { partial: true },
      );
      await em.flush();
      await this.audit.record(
        {
          actor: actor.id,
          action: 'plan_version.imported',
          entityType: 'plan_version',
          entityId: draft.id,
          reason: parsed.header.reason,
          after: { plan: plan.code, version: draft.version, checksum: draft.checksum, file: name, fileRevision: parsed.header.revision, author: parsed.header.author },
        },
        em,
      );
      await em.flush();
      await em.populate(draft, ['plan', 'plan.product', 'createdBy', 'releasedBy', 'submittedBy', 'retiredBy']);
      return toPlanVersionDto(draft);
    });
  }

  /** The version as a plan file: file name and YAML text. */
  async exportFile(id: number): Promise<{ fileName: string; text: string }> {
    const v = await this.plans.versionEntity(id);
    const text = planFileText(
      {
        planCode: v.plan.code,
        planName: v.plan.name,
        partNumber: v.plan.product.partNumber,
        revision: v.fileRevision ?? v.version,
        reason: v.reason,
        author: v.author ?? v.createdBy?.displayName ?? 'Railwright',
        stopAtFirstFailure: v.stopAtFirstFailure,
        maxAttempts: v.maxAttempts,
      },
      v.steps,
    );
    return { fileName: `${v.plan.code}-v${v.version}.plan.yaml`, text };
  }
}

/** 1-based line of the first `key:` in the text (for problems found after parsing); 0 when absent. */
function lineOf(text: string, key: string): number {
  const i = text.split('\n').findIndex((l) => l.trimStart().startsWith(`${key}:`));
  return i + 1;
}
