import { Migration } from '@mikro-orm/migrations';

/**
 * Repair records and the list of repair causes (issue 12). New tables only: existing units, runs and audit
 * events are untouched. A record is never edited; `corrects_id` points a correction at the record it corrects.
 * Dates are stored as the ORM writes them (epoch milliseconds).
 */
export class Migration20261202154000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`create table \`repair_causes\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`name\` text not null, \`active\` integer not null default true);`);
    this.addSql(`create unique index \`repair_causes_name_unique\` on \`repair_causes\` (\`name\`);`);

    this.addSql(`create table \`repair_records\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`unit_id\` integer not null, \`cause_id\` integer not null, \`symptom\` text not null, \`action_taken\` text not null, \`disposition\` text check (\`disposition\` in ('retest', 'scrapped')) not null, \`technician_id\` integer not null, \`recorded_at\` datetime not null, \`failed_run_id\` integer null, \`corrects_id\` integer null, \`correction_reason\` text null, constraint \`repair_records_unit_id_foreign\` foreign key(\`unit_id\`) references \`units\`(\`id\`) on update cascade, constraint \`repair_records_cause_id_foreign\` foreign key(\`cause_id\`) references \`repair_causes\`(\`id\`) on update cascade, constraint \`repair_records_technician_id_foreign\` foreign key(\`technician_id\`) references \`users\`(\`id\`) on update cascade, constraint \`repair_records_failed_run_id_foreign\` foreign key(\`failed_run_id\`) references \`test_runs\`(\`id\`) on delete set null on update cascade, constraint \`repair_records_corrects_id_foreign\` foreign key(\`corrects_id\`) references \`repair_records\`(\`id\`) on update cascade);`);
    this.addSql(`create index \`repair_records_unit_id_index\` on \`repair_records\` (\`unit_id\`);`);
    this.addSql(`create index \`repair_records_cause_id_index\` on \`repair_records\` (\`cause_id\`);`);
    this.addSql(`create index \`repair_records_corrects_id_index\` on \`repair_records\` (\`corrects_id\`);`);
    this.addSql(`create index \`repair_records_recorded_at_index\` on \`repair_records\` (\`recorded_at\`);`);
    this.addSql(`create index \`repair_records_failed_run_id_index\` on \`repair_records\` (\`failed_run_id\`);`);
  }

  override async down(): Promise<void> {
    this.addSql('drop table if exists `repair_records`;');
    this.addSql('drop table if exists `repair_causes`;');
  }
}
