import { Migration } from '@mikro-orm/migrations';

/**
 * Calibration records (issue 10): one row per calibration of a fixture, never edited, with the certificate's
 * per-quantity expanded uncertainties and its PDF. Runs record the calibration they were judged with
 * (`test_runs.calibration_id`, null for runs from before).
 *
 * Data: each existing fixture's current calibration (its columns) becomes its first record, so an upgraded
 * database keeps it. That record states no per-quantity uncertainty (`{}`): guard bands of the next runs stay
 * exactly what they were before the upgrade (the plan's value, else the fixture's voltage uncertainty).
 */
export class Migration20261202151000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(
      `create table \`calibration_records\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, ` +
        `\`fixture_id\` integer not null, \`calibrated_at\` datetime null, \`due_at\` datetime not null, \`recorded_by_id\` integer null, \`certificate_number\` text null, ` +
        `\`voltage_uncertainty_v\` double not null, \`current_uncertainty_a\` double not null, \`uncertainties\` json not null, ` +
        `\`certificate_file_name\` text null, \`certificate_size_bytes\` integer null, \`certificate_pdf\` blob null, ` +
        `constraint \`calibration_records_fixture_id_foreign\` foreign key(\`fixture_id\`) references \`fixtures\`(\`id\`) on update cascade, ` +
        `constraint \`calibration_records_recorded_by_id_foreign\` foreign key(\`recorded_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade);`,
    );
    this.addSql(`create index \`calibration_records_fixture_id_index\` on \`calibration_records\` (\`fixture_id\`);`);
    this.addSql(`create index \`calibration_records_recorded_by_id_index\` on \`calibration_records\` (\`recorded_by_id\`);`);
    this.addSql(`create index \`calibration_records_fixture_id_calibrated_at_index\` on \`calibration_records\` (\`fixture_id\`, \`calibrated_at\`);`);
    this.addSql(
      `insert into \`calibration_records\` (\`created_at\`, \`updated_at\`, \`fixture_id\`, \`calibrated_at\`, \`due_at\`, \`recorded_by_id\`, \`certificate_number\`, \`voltage_uncertainty_v\`, \`current_uncertainty_a\`, \`uncertainties\`) ` +
        `select \`updated_at\`, \`updated_at\`, \`id\`, \`calibrated_at\`, \`calibration_due_at\`, null, \`calibration_certificate\`, \`voltage_uncertainty_v\`, \`current_uncertainty_a\`, '{}' from \`fixtures\` order by \`id\`;`,
    );
    this.addSql(`alter table \`test_runs\` add column \`calibration_id\` integer null references \`calibration_records\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`create index \`test_runs_calibration_id_index\` on \`test_runs\` (\`calibration_id\`);`);
  }
}
