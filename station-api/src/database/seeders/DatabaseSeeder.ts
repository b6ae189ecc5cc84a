import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { DemoPlantSeeder } from './DemoPlantSeeder';
import { PlanSeeder } from './PlanSeeder';
import { HistorySeeder } from './HistorySeeder';
import { HoldRuleSeeder } from './HoldRuleSeeder';
import { CalibrationSeeder } from './CalibrationSeeder';
import { RepairCauseSeeder } from './RepairCauseSeeder';

/**
 * Demo data, in order: plant master data, released test plans, then test history. Every seeder is
 * idempotent, so the whole chain can run on every start.
 */
export class DatabaseSeeder extends Seeder {
  async run(em: EntityManager): Promise<void> {
    await this.call(em, [DemoPlantSeeder]);
    // Next seeders go here, in this order (add each line once its file exists):
    await this.call(em, [PlanSeeder]); // released plan versions from test-plans/
    await this.call(em, [HistorySeeder]); // runs the real engine; skips itself when SEED_HISTORY=0 (e2e tests) or runs exist
    await this.call(em, [HoldRuleSeeder]); // one hold rule per demo product (demo history only)
    await this.call(em, [CalibrationSeeder]); // calibration records of the demo fixtures (issue 10, H2)
    await this.call(em, [RepairCauseSeeder]); // the list of repair causes (H6, issue 12)
  }
}
