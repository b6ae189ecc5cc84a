import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { AuditEvent } from '../../audit/audit-event.entity';
import { DEFAULT_PLANS_DIR, loadAllPlanFiles, planSourceName, type PlanFile } from '../../plans/plan-file';
import { PlanVersion, PlanVersionState } from '../../plans/plan-version.entity';
import { TestPlan } from '../../plans/test-plan.entity';
import { Product } from '../../products/product.entity';

/**
 * Released plan versions from the files in test-plans/. Idempotent: a file whose steps (by checksum) are already
 * stored as a version of its plan is skipped; a changed file becomes the next version, released, and the version
 * it replaces is superseded. A file with any problem stops the seeding with the file, line and field named.
 */
export class PlanSeeder extends Seeder {
  /** Folder to read; tests point it elsewhere. */
  static plansDir = DEFAULT_PLANS_DIR;

  async run(em: EntityManager): Promise<void> {
    const products = await em.find(Product, {});
    const files = loadAllPlanFiles(PlanSeeder.plansDir, {
      products: products.map((p) => ({
        partNumber: p.partNumber,
        vinMinV: p.vinMinV,
        vinNomV: p.vinNomV,
        vinMaxV: p.vinMaxV,
        voutNomV: p.voutNomV,
        ioutRatedA: p.ioutRatedA,
      })),
    });
    await em.transactional(async (tx) => {
      for (const file of files) await this.seedFile(tx, file, products.find((p) => p.partNumber === file.header.partNumber)!);
    });
  }

  private async seedFile(em: EntityManager, file: PlanFile, product: Product): Promise<void> {
    const { header } = file;
    let plan = await em.findOne(TestPlan, { code: header.planCode });
    if (!plan) {
      plan = em.create(TestPlan, { code: header.planCode, name: header.planName, product: em.getReference(Product, product.id) }, { partial: true });
      await em.flush();
    }
    if (await em.count(PlanVersion, { plan, checksum: file.checksum })) return;

    const last = await em.findOne(PlanVersion, { plan }, { orderBy: { version: 'desc' } });
    const released = await em.find(PlanVersion, { plan, state: PlanVersionState.Released });
    for (const v of released) v.state = PlanVersionState.Superseded;
    // the version table has no author or file-revision column; both are kept in the reason text
    const reason = `${header.reason} (plan file revision ${header.revision}, ${header.author})`;
    const version = em.create(
      PlanVersion,
      {
        plan,
        version: (last?.version ?? 0) + 1,
        state: PlanVersionState.Released,
        reason,
        stopAtFirstFailure: header.stopAtFirstFailure,
        maxAttempts: header.maxAttempts,
        steps: file.steps,
        checksum: file.checksum,
        sourceFile: planSourceName(file),
        releasedAt: new Date(),
      },
      { partial: true },
    );
    await em.flush();
    em.create(
      AuditEvent,
      {
        at: new Date(),
        actorName: 'seeder',
        action: 'plan_version.released',
        entityType: 'plan_version',
        entityId: String(version.id),
        reason,
        before: { plan: plan.code, releasedVersions: released.map((v) => v.version) },
        after: { plan: plan.code, version: version.version, checksum: version.checksum, sourceFile: version.sourceFile },
      },
      { partial: true },
    );
    await em.flush();
  }
}
