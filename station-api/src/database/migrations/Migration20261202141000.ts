import { Migration } from '@mikro-orm/migrations';

/**
 * Plan version lifecycle: a draft is submitted for release with a change reason (`submitted_at`,
 * `submitted_by_id`, `change_reason`), released by a second engineer, and a released or superseded version can be
 * retired (`retired_at`, `retired_by_id`, `retire_reason`) without losing it. The plan-file header fields that
 * have no other home (`author`, `file_revision`) are kept so that an imported file exports with the same content.
 * New nullable columns only: the `state` CHECK constraint stays as it is.
 */
export class Migration20261202141000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table \`plan_versions\` add column \`submitted_at\` datetime null;`);
    this.addSql(`alter table \`plan_versions\` add column \`submitted_by_id\` integer null references \`users\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`plan_versions\` add column \`change_reason\` text null;`);
    this.addSql(`alter table \`plan_versions\` add column \`retired_at\` datetime null;`);
    this.addSql(`alter table \`plan_versions\` add column \`retired_by_id\` integer null references \`users\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`plan_versions\` add column \`retire_reason\` text null;`);
    this.addSql(`alter table \`plan_versions\` add column \`author\` text null;`);
    this.addSql(`alter table \`plan_versions\` add column \`file_revision\` integer null;`);
  }
}
