import { Migration } from '@mikro-orm/migrations';

/**
 * Characterization data sets (issue 10, limits from data): the per-unit measurements of a pilot build, uploaded as
 * CSV and kept whole (columns, serials and values as JSON) so that limits can be derived from them and the audit
 * trail can name them. A new table only: nothing existing changes.
 */
export class Migration20261202150000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(
      `create table \`characterization_data_sets\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, ` +
        `\`name\` text not null, \`file_name\` text not null, \`product_id\` integer null, \`uploaded_by_id\` integer not null, \`uploaded_at\` datetime not null, ` +
        `\`row_count\` integer not null, \`columns\` json not null, \`serials\` json not null, \`values\` json not null, ` +
        `constraint \`characterization_data_sets_product_id_foreign\` foreign key(\`product_id\`) references \`products\`(\`id\`) on delete set null on update cascade, ` +
        `constraint \`characterization_data_sets_uploaded_by_id_foreign\` foreign key(\`uploaded_by_id\`) references \`users\`(\`id\`) on update cascade);`,
    );
    this.addSql(`create unique index \`characterization_data_sets_name_unique\` on \`characterization_data_sets\` (\`name\`);`);
    this.addSql(`create index \`characterization_data_sets_product_id_index\` on \`characterization_data_sets\` (\`product_id\`);`);
    this.addSql(`create index \`characterization_data_sets_uploaded_by_id_index\` on \`characterization_data_sets\` (\`uploaded_by_id\`);`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`characterization_data_sets\`;`);
  }
}
