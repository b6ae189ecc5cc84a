import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { loadEnv } from '../../config/env.validation';
import { HoldRule, HoldRuleKind } from '../../holds/hold-rule.entity';
import { Product } from '../../products/product.entity';
import { User } from '../../users/user.entity';

/**
 * One hold rule per demo product, added by the quality user. Thresholds sit well below what the simulated
 * fixtures produce (about 3 % defective units), so the demo starts with every lot open; a run of bad units
 * (e.g. the simulator's defect settings) trips them. Only with the demo history (SEED_HISTORY=1): the e2e
 * tests seed without it and add the rules they test.
 */
export const DEMO_HOLD_RULES: { partNumber: string; rule: Partial<HoldRule> & { kind: HoldRuleKind } }[] = [
  { partNumber: 'OB-BK0503', rule: { kind: HoldRuleKind.Fpy, windowUnits: 50, minFpyPct: 85 } },
  { partNumber: 'OB-BK3305', rule: { kind: HoldRuleKind.ConsecutiveFailures, failuresInRow: 4 } },
  { partNumber: 'OB-BK1202', rule: { kind: HoldRuleKind.Fpy, windowUnits: 40, minFpyPct: 80 } },
];

export class HoldRuleSeeder extends Seeder {
  async run(em: EntityManager): Promise<void> {
    if (loadEnv().SEED_HISTORY !== '1') return;
    if ((await em.count(HoldRule, {})) > 0) return;
    const quality = await em.findOne(User, { username: 'quality' });
    for (const { partNumber, rule } of DEMO_HOLD_RULES) {
      const product = await em.findOne(Product, { partNumber });
      if (!product) continue;
      em.create(HoldRule, { ...rule, product, active: true, createdBy: quality ?? undefined }, { partial: true });
    }
    await em.flush();
  }
}
