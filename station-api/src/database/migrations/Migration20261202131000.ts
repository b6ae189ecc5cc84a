import { Migration } from '@mikro-orm/migrations';

/**
 * Retest policy (issue 8): a failed unit with attempts left stays off the repair queue unless the operator
 * sends it there; `sent_to_repair_at` records when that happened (null: not sent).
 */
export class Migration20261202131000 extends Migration {
  override async up(): Promise<void> {
    this.addSql('alter table `units` add column `sent_to_repair_at` datetime null;');
  }

  override async down(): Promise<void> {
    this.addSql('alter table `units` drop column `sent_to_repair_at`;');
  }
}
