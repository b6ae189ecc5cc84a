import { Migration } from '@mikro-orm/migrations';

/**
 * Run integrity: why a run ended (`end_reason`), the operator's name as it was at the start
 * (`operator_name`), each measurement's ILAC-G8 decision statement (`decision`), and at most one running
 * run per unit and per station, guaranteed by partial unique indexes.
 */
export class Migration20261202130000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table \`test_runs\` add column \`end_reason\` text null;`);
    this.addSql(`alter table \`test_runs\` add column \`operator_name\` text null;`);
    this.addSql(`alter table \`measurements\` add column \`decision\` text null;`);
    // runs written before this release keep the name their operator has now (the best that is known)
    this.addSql(`update \`test_runs\` set \`operator_name\` = (select \`display_name\` from \`users\` where \`users\`.\`id\` = \`test_runs\`.\`operator_id\`);`);
    // a run still `running` here was cut off by a stop of the previous release (nothing runs while migrating):
    // close it as interrupted and count it as an attempt, as the start-up recovery does, so the indexes hold
    this.addSql(
      `update \`units\` set \`test_count\` = \`test_count\` + (select count(*) from \`test_runs\` r where r.\`unit_id\` = \`units\`.\`id\` and r.\`verdict\` = 'running') ` +
        `where \`id\` in (select \`unit_id\` from \`test_runs\` where \`verdict\` = 'running');`,
    );
    this.addSql(
      `update \`test_runs\` set \`verdict\` = 'error', \`end_reason\` = 'interrupted', ` +
        `\`error_message\` = 'Interrupted: the station server stopped during this run (closed when the server was upgraded)', ` +
        `\`finished_at\` = coalesce((select max(m.\`measured_at\`) from \`measurements\` m where m.\`run_id\` = \`test_runs\`.\`id\`), \`started_at\`) ` +
        `where \`verdict\` = 'running';`,
    );
    this.addSql(`create unique index \`test_runs_one_running_per_unit\` on \`test_runs\` (\`unit_id\`) where \`verdict\` = 'running';`);
    this.addSql(`create unique index \`test_runs_one_running_per_station\` on \`test_runs\` (\`station_id\`) where \`verdict\` = 'running';`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop index \`test_runs_one_running_per_station\`;`);
    this.addSql(`drop index \`test_runs_one_running_per_unit\`;`);
    this.addSql(`alter table \`measurements\` drop column \`decision\`;`);
    this.addSql(`alter table \`test_runs\` drop column \`operator_name\`;`);
    this.addSql(`alter table \`test_runs\` drop column \`end_reason\`;`);
  }
}
