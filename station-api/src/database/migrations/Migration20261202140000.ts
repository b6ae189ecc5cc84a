import { Migration } from '@mikro-orm/migrations';

/**
 * Plant-scale reads (issue 11): the indexes the floor screens, the runs list and the yield queries need once
 * a year of history is stored. Each serves a query named beside it; docs/performance.md has the figures.
 */
export class Migration20261202140000 extends Migration {
  override async up(): Promise<void> {
    // board "last runs" of a station (finished_at desc) and the shift summary (station, finished_at window)
    this.addSql('create index if not exists `test_runs_station_id_finished_at_index` on `test_runs` (`station_id`, `finished_at`);');
    // repair queue: the last failing run of each waiting unit; attempt and yield counts per unit
    this.addSql('create index if not exists `test_runs_unit_id_verdict_index` on `test_runs` (`unit_id`, `verdict`);');
    // runs list filtered by verdict, newest first, without sorting every run of that verdict
    this.addSql('create index if not exists `test_runs_verdict_started_at_index` on `test_runs` (`verdict`, `started_at`);');
    // trend of one quantity over time (step, quantity, time window) without reading the whole step
    this.addSql('create index if not exists `measurements_step_key_quantity_measured_at_index` on `measurements` (`step_key`, `quantity`, `measured_at`);');
  }

  override async down(): Promise<void> {
    this.addSql('drop index if exists `measurements_step_key_quantity_measured_at_index`;');
    this.addSql('drop index if exists `test_runs_verdict_started_at_index`;');
    this.addSql('drop index if exists `test_runs_unit_id_verdict_index`;');
    this.addSql('drop index if exists `test_runs_station_id_finished_at_index`;');
  }
}
