import { Migration } from '@mikro-orm/migrations';

/**
 * Runs list at plant scale (issue 11, bench:floor): every sort the list offers reads its page from an index
 * instead of sorting the whole history (src/runs/run-list-order.ts walks them). Each index serves the sort named
 * beside it; an index that a new one makes redundant (same leading column) is dropped. docs/performance.md has
 * the figures and the bytes per measurement before and after.
 */
export class Migration20261203030000 extends Migration {
  override async up(): Promise<void> {
    // sort by attempt: each attempt number newest first
    this.addSql('create index if not exists `test_runs_attempt_started_at_index` on `test_runs` (`attempt`, `started_at`);');
    // sort by failed step: each step key newest first; replaces the index on the key alone
    this.addSql('create index if not exists `test_runs_failed_step_key_started_at_index` on `test_runs` (`failed_step_key`, `started_at`);');
    this.addSql('drop index if exists `test_runs_failed_step_key_index`;');
    // sort by plan: each plan version newest first; replaces the index on the version alone
    this.addSql('create index if not exists `test_runs_plan_version_id_started_at_index` on `test_runs` (`plan_version_id`, `started_at`);');
    this.addSql('drop index if exists `test_runs_plan_version_id_index`;');
    // sort by operator: the name stored with the run, in the list's case-insensitive order
    this.addSql('create index if not exists `test_runs_operator_name_nocase_index` on `test_runs` (`operator_name` collate nocase, `started_at`);');
    // sort by duration: the same expression the list orders by
    this.addSql('create index if not exists `test_runs_duration_index` on `test_runs` ((`finished_at` - `started_at`), `started_at`);');
    // sort by serial: units in the list's case-insensitive order (the unique index is binary)
    this.addSql('create index if not exists `units_serial_nocase_index` on `units` (`serial` collate nocase);');
    // single-column indexes that a composite index with the same leading column already serves (an equality
    // on the column, a foreign key check): their bytes pay for the sort indexes above
    for (const column of ['station_id', 'lot_id', 'fixture_id', 'product_id', 'unit_id', 'verdict']) {
      this.addSql(`drop index if exists \`test_runs_${column}_index\`;`);
    }
    // the trend of one quantity is served by Migration20261203010000's (def_id, measured_at) index on
    // measurement_values: `measurements` is a view from that migration on, so no index is made on it here
  }

  override async down(): Promise<void> {
    for (const column of ['station_id', 'lot_id', 'fixture_id', 'product_id', 'unit_id', 'verdict']) {
      this.addSql(`create index if not exists \`test_runs_${column}_index\` on \`test_runs\` (\`${column}\`);`);
    }
    this.addSql('drop index if exists `units_serial_nocase_index`;');
    this.addSql('drop index if exists `test_runs_duration_index`;');
    this.addSql('drop index if exists `test_runs_operator_name_nocase_index`;');
    this.addSql('create index if not exists `test_runs_plan_version_id_index` on `test_runs` (`plan_version_id`);');
    this.addSql('drop index if exists `test_runs_plan_version_id_started_at_index`;');
    this.addSql('create index if not exists `test_runs_failed_step_key_index` on `test_runs` (`failed_step_key`);');
    this.addSql('drop index if exists `test_runs_failed_step_key_started_at_index`;');
    this.addSql('drop index if exists `test_runs_attempt_started_at_index`;');
  }
}
