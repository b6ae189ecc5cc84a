import { Migration } from '@mikro-orm/migrations';

export class Migration20261202070745 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`fixtures\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`code\` text not null, \`name\` text not null, \`port_path\` text not null, \`baud_rate\` integer not null default 115200, \`command_timeout_ms\` integer not null default 2000, \`calibrated_at\` datetime null, \`calibration_due_at\` datetime not null, \`calibration_certificate\` text null, \`voltage_uncertainty_v\` double not null default 0.005, \`current_uncertainty_a\` double not null default 0.005, \`contact_cycles_used\` integer not null default 0, \`contact_cycles_allowed\` integer not null default 50000, \`active\` integer not null default true);`);
    this.addSql(`create unique index \`fixtures_code_unique\` on \`fixtures\` (\`code\`);`);

    this.addSql(`create table \`products\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`part_number\` text not null, \`name\` text not null, \`family\` text not null, \`vin_min_v\` double not null, \`vin_nom_v\` double not null, \`vin_max_v\` double not null, \`vout_nom_v\` double not null, \`iout_rated_a\` double not null, \`serial_pattern\` text not null, \`active\` integer not null default true);`);
    this.addSql(`create unique index \`products_part_number_unique\` on \`products\` (\`part_number\`);`);

    this.addSql(`create table \`lots\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`code\` text not null, \`product_id\` integer not null, \`planned_quantity\` integer not null, \`state\` text check (\`state\` in ('open', 'on_hold', 'released', 'closed')) not null default 'open', \`hold_reason\` text null, constraint \`lots_product_id_foreign\` foreign key(\`product_id\`) references \`products\`(\`id\`) on update cascade);`);
    this.addSql(`create unique index \`lots_code_unique\` on \`lots\` (\`code\`);`);
    this.addSql(`create index \`lots_product_id_index\` on \`lots\` (\`product_id\`);`);
    this.addSql(`create index \`lots_state_index\` on \`lots\` (\`state\`);`);

    this.addSql(`create table \`stations\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`code\` text not null, \`name\` text not null, \`location\` text null, \`fixture_id\` integer null, \`active_lot_id\` integer null, \`active\` integer not null default true, constraint \`stations_fixture_id_foreign\` foreign key(\`fixture_id\`) references \`fixtures\`(\`id\`) on delete set null on update cascade, constraint \`stations_active_lot_id_foreign\` foreign key(\`active_lot_id\`) references \`lots\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create unique index \`stations_code_unique\` on \`stations\` (\`code\`);`);
    this.addSql(`create index \`stations_fixture_id_index\` on \`stations\` (\`fixture_id\`);`);
    this.addSql(`create index \`stations_active_lot_id_index\` on \`stations\` (\`active_lot_id\`);`);

    this.addSql(`create table \`test_plans\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`code\` text not null, \`name\` text not null, \`product_id\` integer not null, constraint \`test_plans_product_id_foreign\` foreign key(\`product_id\`) references \`products\`(\`id\`) on update cascade);`);
    this.addSql(`create unique index \`test_plans_code_unique\` on \`test_plans\` (\`code\`);`);
    this.addSql(`create index \`test_plans_product_id_index\` on \`test_plans\` (\`product_id\`);`);

    this.addSql(`create table \`units\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`serial\` text not null, \`lot_id\` integer not null, \`product_id\` integer not null, \`state\` text check (\`state\` in ('untested', 'passed', 'failed', 'in_repair', 'scrapped')) not null default 'untested', \`test_count\` integer not null default 0, \`last_tested_at\` datetime null, \`test_count_at_return\` integer not null default 0, constraint \`units_lot_id_foreign\` foreign key(\`lot_id\`) references \`lots\`(\`id\`) on update cascade, constraint \`units_product_id_foreign\` foreign key(\`product_id\`) references \`products\`(\`id\`) on update cascade);`);
    this.addSql(`create unique index \`units_serial_unique\` on \`units\` (\`serial\`);`);
    this.addSql(`create index \`units_lot_id_index\` on \`units\` (\`lot_id\`);`);
    this.addSql(`create index \`units_product_id_index\` on \`units\` (\`product_id\`);`);
    this.addSql(`create index \`units_state_index\` on \`units\` (\`state\`);`);

    this.addSql(`create table \`users\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`username\` text not null, \`display_name\` text not null, \`password_hash\` text not null, \`roles\` json not null, \`active\` integer not null default true);`);
    this.addSql(`create unique index \`users_username_unique\` on \`users\` (\`username\`);`);

    this.addSql(`create table \`plan_versions\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`plan_id\` integer not null, \`version\` integer not null, \`state\` text check (\`state\` in ('draft', 'released', 'superseded')) not null default 'draft', \`reason\` text not null, \`stop_at_first_failure\` integer not null default false, \`max_attempts\` integer not null default 3, \`steps\` json not null, \`checksum\` text not null, \`source_file\` text null, \`created_by_id\` integer null, \`released_by_id\` integer null, \`released_at\` datetime null, constraint \`plan_versions_plan_id_foreign\` foreign key(\`plan_id\`) references \`test_plans\`(\`id\`) on update cascade, constraint \`plan_versions_created_by_id_foreign\` foreign key(\`created_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade, constraint \`plan_versions_released_by_id_foreign\` foreign key(\`released_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create index \`plan_versions_plan_id_index\` on \`plan_versions\` (\`plan_id\`);`);
    this.addSql(`create index \`plan_versions_created_by_id_index\` on \`plan_versions\` (\`created_by_id\`);`);
    this.addSql(`create index \`plan_versions_released_by_id_index\` on \`plan_versions\` (\`released_by_id\`);`);
    this.addSql(`create unique index \`plan_versions_plan_id_version_unique\` on \`plan_versions\` (\`plan_id\`, \`version\`);`);

    this.addSql(`create table \`test_runs\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`unit_id\` integer not null, \`lot_id\` integer not null, \`product_id\` integer not null, \`station_id\` integer not null, \`fixture_id\` integer not null, \`plan_version_id\` integer not null, \`operator_id\` integer not null, \`attempt\` integer not null, \`verdict\` text check (\`verdict\` in ('running', 'pass', 'fail', 'error', 'aborted')) not null default 'running', \`started_at\` datetime not null, \`finished_at\` datetime null, \`failed_step_key\` text null, \`error_message\` text null, \`fixture_identity\` text null, \`fixture_calibration_due_at\` datetime null, \`fixture_contact_cycles\` integer null, \`override_reason\` text null, \`override_by_id\` integer null, constraint \`test_runs_unit_id_foreign\` foreign key(\`unit_id\`) references \`units\`(\`id\`) on update cascade, constraint \`test_runs_lot_id_foreign\` foreign key(\`lot_id\`) references \`lots\`(\`id\`) on update cascade, constraint \`test_runs_product_id_foreign\` foreign key(\`product_id\`) references \`products\`(\`id\`) on update cascade, constraint \`test_runs_station_id_foreign\` foreign key(\`station_id\`) references \`stations\`(\`id\`) on update cascade, constraint \`test_runs_fixture_id_foreign\` foreign key(\`fixture_id\`) references \`fixtures\`(\`id\`) on update cascade, constraint \`test_runs_plan_version_id_foreign\` foreign key(\`plan_version_id\`) references \`plan_versions\`(\`id\`) on update cascade, constraint \`test_runs_operator_id_foreign\` foreign key(\`operator_id\`) references \`users\`(\`id\`) on update cascade, constraint \`test_runs_override_by_id_foreign\` foreign key(\`override_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create index \`test_runs_unit_id_index\` on \`test_runs\` (\`unit_id\`);`);
    this.addSql(`create index \`test_runs_lot_id_index\` on \`test_runs\` (\`lot_id\`);`);
    this.addSql(`create index \`test_runs_product_id_index\` on \`test_runs\` (\`product_id\`);`);
    this.addSql(`create index \`test_runs_station_id_index\` on \`test_runs\` (\`station_id\`);`);
    this.addSql(`create index \`test_runs_fixture_id_index\` on \`test_runs\` (\`fixture_id\`);`);
    this.addSql(`create index \`test_runs_plan_version_id_index\` on \`test_runs\` (\`plan_version_id\`);`);
    this.addSql(`create index \`test_runs_operator_id_index\` on \`test_runs\` (\`operator_id\`);`);
    this.addSql(`create index \`test_runs_verdict_index\` on \`test_runs\` (\`verdict\`);`);
    this.addSql(`create index \`test_runs_started_at_index\` on \`test_runs\` (\`started_at\`);`);
    this.addSql(`create index \`test_runs_failed_step_key_index\` on \`test_runs\` (\`failed_step_key\`);`);
    this.addSql(`create index \`test_runs_override_by_id_index\` on \`test_runs\` (\`override_by_id\`);`);
    this.addSql(`create index \`test_runs_product_id_started_at_index\` on \`test_runs\` (\`product_id\`, \`started_at\`);`);
    this.addSql(`create index \`test_runs_fixture_id_started_at_index\` on \`test_runs\` (\`fixture_id\`, \`started_at\`);`);
    this.addSql(`create index \`test_runs_station_id_started_at_index\` on \`test_runs\` (\`station_id\`, \`started_at\`);`);
    this.addSql(`create index \`test_runs_lot_id_started_at_index\` on \`test_runs\` (\`lot_id\`, \`started_at\`);`);

    this.addSql(`create table \`measurements\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`run_id\` integer not null, \`step_index\` integer not null, \`step_key\` text not null, \`step_name\` text not null, \`quantity\` text not null, \`name\` text not null, \`value\` double null, \`unit\` text not null, \`low_limit\` double null, \`high_limit\` double null, \`guarded_low\` double null, \`guarded_high\` double null, \`uncertainty\` double not null default 0, \`rule\` text not null, \`verdict\` text check (\`verdict\` in ('pass', 'fail', 'guard_fail')) not null, \`raw\` json null, \`started_at\` datetime not null, \`measured_at\` datetime not null, constraint \`measurements_run_id_foreign\` foreign key(\`run_id\`) references \`test_runs\`(\`id\`) on update cascade);`);
    this.addSql(`create index \`measurements_run_id_index\` on \`measurements\` (\`run_id\`);`);
    this.addSql(`create index \`measurements_step_key_measured_at_index\` on \`measurements\` (\`step_key\`, \`measured_at\`);`);

    this.addSql(`create table \`audit_events\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`at\` datetime not null, \`actor_id\` integer null, \`actor_name\` text null, \`action\` text not null, \`entity_type\` text not null, \`entity_id\` text null, \`reason\` text null, \`before\` json null, \`after\` json null, constraint \`audit_events_actor_id_foreign\` foreign key(\`actor_id\`) references \`users\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create index \`audit_events_at_index\` on \`audit_events\` (\`at\`);`);
    this.addSql(`create index \`audit_events_actor_id_index\` on \`audit_events\` (\`actor_id\`);`);
    this.addSql(`create index \`audit_events_action_index\` on \`audit_events\` (\`action\`);`);
    this.addSql(`create index \`audit_events_entity_type_entity_id_index\` on \`audit_events\` (\`entity_type\`, \`entity_id\`);`);
  }

}
