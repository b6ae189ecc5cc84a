import { Migration } from '@mikro-orm/migrations';

/**
 * Yield views at plant scale (issue 12, bench:yield): the indexes the yield queries need once a year of
 * history is stored. Each serves a query named beside it; docs/performance.md has the figures.
 */
export class Migration20261202155000 extends Migration {
  override async up(): Promise<void> {
    // capability, control chart, export of one quantity: the filtered runs are read first and each run's
    // value of the quantity is found by one seek instead of a walk over the run's 14 rows; with the value in
    // the index the capability's values are read from the index alone (bench:yield: 370 -> 160 ms for 8,240)
    this.addSql('create index if not exists `measurements_run_id_step_key_quantity_value_index` on `measurements` (`run_id`, `step_key`, `quantity`, `value`);');
    // first and latest judged run of a unit (per-unit yield, unit history in attempt order)
    this.addSql('create index if not exists `test_runs_unit_id_attempt_index` on `test_runs` (`unit_id`, `attempt`);');
  }

  override async down(): Promise<void> {
    this.addSql('drop index if exists `test_runs_unit_id_attempt_index`;');
    this.addSql('drop index if exists `measurements_run_id_step_key_quantity_value_index`;');
  }
}
