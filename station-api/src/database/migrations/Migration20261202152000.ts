import { Migration } from '@mikro-orm/migrations';

/**
 * Lot release and close (issue 12): who released or closed a lot, when, and why it was closed (new nullable
 * columns on `lots`, so every existing lot keeps its row), and `lot_certificates`, the certificate of conformance
 * issued by a release, stored as the PDF bytes with their SHA-256 so every download returns the same document.
 */
export class Migration20261202152000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table \`lots\` add column \`released_at\` datetime null;`);
    this.addSql(`alter table \`lots\` add column \`released_by_id\` integer null references \`users\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`lots\` add column \`closed_at\` datetime null;`);
    this.addSql(`alter table \`lots\` add column \`closed_by_id\` integer null references \`users\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`lots\` add column \`close_reason\` text null;`);
    this.addSql(
      `create table \`lot_certificates\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`lot_id\` integer not null, \`issued_at\` datetime not null, \`issued_by_id\` integer not null, \`issued_by_name\` text not null, \`comment\` text null, \`file_name\` text not null, \`sha256\` text not null, \`pdf\` blob not null, constraint \`lot_certificates_lot_id_foreign\` foreign key(\`lot_id\`) references \`lots\`(\`id\`) on update cascade, constraint \`lot_certificates_issued_by_id_foreign\` foreign key(\`issued_by_id\`) references \`users\`(\`id\`) on update cascade);`,
    );
    this.addSql(`create unique index \`lot_certificates_lot_id_unique\` on \`lot_certificates\` (\`lot_id\`);`);
    this.addSql(`create index \`lot_certificates_issued_by_id_index\` on \`lot_certificates\` (\`issued_by_id\`);`);
  }

  override async down(): Promise<void> {
    this.addSql('drop table if exists `lot_certificates`;');
    this.addSql('alter table `lots` drop column `close_reason`;');
    this.addSql('alter table `lots` drop column `closed_by_id`;');
    this.addSql('alter table `lots` drop column `closed_at`;');
    this.addSql('alter table `lots` drop column `released_by_id`;');
    this.addSql('alter table `lots` drop column `released_at`;');
  }
}
