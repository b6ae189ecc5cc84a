import { Migration } from '@mikro-orm/migrations';

/**
 * The audit trail is append-only in the database itself, not only because no route edits it: triggers refuse
 * every UPDATE and DELETE on `audit_events` (SQLite `RAISE(ABORT, ...)` rolls back the statement). Nothing in the
 * application updates or deletes audit rows; users are deactivated, never deleted, so the `actor_id` foreign key's
 * ON DELETE SET NULL never fires.
 */
export class Migration20261202156000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(
      `create trigger if not exists \`audit_events_no_update\` before update on \`audit_events\` begin select raise(abort, 'audit records cannot be changed'); end;`,
    );
    this.addSql(
      `create trigger if not exists \`audit_events_no_delete\` before delete on \`audit_events\` begin select raise(abort, 'audit records cannot be deleted'); end;`,
    );
  }

  override async down(): Promise<void> {
    this.addSql('drop trigger if exists `audit_events_no_update`;');
    this.addSql('drop trigger if exists `audit_events_no_delete`;');
  }
}
