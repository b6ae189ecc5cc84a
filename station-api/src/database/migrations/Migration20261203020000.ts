import { Migration } from '@mikro-orm/migrations';

/**
 * Rolled throughput yield without reading measurements (issue 12, bench:yield: the product's 30-day yield read
 * ~112,000 measurement rows to learn which steps each first run entered and failed).
 *
 * `run_steps` holds one narrow row per (run, step) that stored measurements: whether any of the step's
 * measurements failed (FAIL or guard-band FAIL). Step key and name live once in `step_labels`. Both are kept by
 * a trigger on the measurement INSERT (on `measurement_values`, the table behind the `measurements` view), so the row is written inside the statement that stores the step's
 * measurements (the engine's one-statement transaction, measurement-store.ts): the summary can never disagree
 * with the measurements it summarises, and every writer (engine, seed, benchmark bulk copy) keeps it without a
 * code path of its own. Measurements are never updated or deleted, so no other trigger is needed.
 *
 * The failed step of a run cannot be derived from `test_runs.failed_step_key`: a plan with
 * stopAtFirstFailure = false measures every step, and several may fail.
 *
 * Cost on the year file (99,684 runs, 1.4 M measurements): 897,156 rows, +12.7 MB = 9 bytes per measurement;
 * the backfill below takes ~15 s there (one pass over the measurements).
 */
export class Migration20261203020000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(
      'create table if not exists `step_labels` (`id` integer not null primary key autoincrement, `step_key` text not null, `step_name` text not null);',
    );
    this.addSql('create unique index if not exists `step_labels_step_key_step_name_unique` on `step_labels` (`step_key`, `step_name`);');
    // clustered by run: the yield query joins a set of runs to their steps
    this.addSql(
      'create table if not exists `run_steps` (`run_id` integer not null, `step_index` integer not null, `step_label_id` integer not null, ' +
        '`failed` integer not null, primary key (`run_id`, `step_index`)) without rowid;',
    );
    // `measurements` is a view from Migration20261203010000 on: the step of a row is its def's, the verdict is
    // coded (0 = pass), and the trigger attaches to the physical `measurement_values`, which every INSERT into
    // the view (its INSTEAD OF trigger) and every bulk copy writes
    this.addSql(
      'insert or ignore into `step_labels` (`step_key`, `step_name`) select distinct `step_key`, `step_name` from `measurement_defs`;',
    );
    this.addSql(
      'insert or ignore into `run_steps` (`run_id`, `step_index`, `step_label_id`, `failed`) ' +
        'select v.`run_id`, d.`step_index`, min(l.`id`), max(v.`verdict` <> 0) from `measurement_values` v ' +
        'join `measurement_defs` d on d.`id` = v.`def_id` ' +
        'join `step_labels` l on l.`step_key` = d.`step_key` and l.`step_name` = d.`step_name` group by v.`run_id`, d.`step_index`;',
    );
    this.addSql(
      'create trigger if not exists `measurement_values_run_steps` after insert on `measurement_values` begin ' +
        'insert or ignore into `step_labels` (`step_key`, `step_name`) select d.`step_key`, d.`step_name` from `measurement_defs` d where d.`id` = new.`def_id`; ' +
        'insert into `run_steps` (`run_id`, `step_index`, `step_label_id`, `failed`) ' +
        'select new.`run_id`, d.`step_index`, l.`id`, new.`verdict` <> 0 from `measurement_defs` d ' +
        'join `step_labels` l on l.`step_key` = d.`step_key` and l.`step_name` = d.`step_name` where d.`id` = new.`def_id` ' +
        'on conflict (`run_id`, `step_index`) do update set `failed` = max(`failed`, excluded.`failed`); ' +
        'end;',
    );
  }

  override async down(): Promise<void> {
    this.addSql('drop trigger if exists `measurement_values_run_steps`;');
    this.addSql('drop table if exists `run_steps`;');
    this.addSql('drop table if exists `step_labels`;');
  }
}
