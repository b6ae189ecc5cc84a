import { Migration } from '@mikro-orm/migrations';

/**
 * Holds and alerts (issue 12): hold rules per product, the holds they put on lots (and their lifting), the
 * alerts history, and the outbox of e-mails. New tables only; no existing row is touched.
 */
export class Migration20261202153000 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`create table \`hold_rules\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`product_id\` integer not null, \`kind\` text check (\`kind\` in ('fpy', 'cpk', 'run_rule', 'consecutive_failures')) not null, \`window_units\` integer null, \`min_fpy_pct\` double null, \`min_cpk\` double null, \`step_key\` text null, \`quantity\` text null, \`rule_set\` text null, \`failures_in_row\` integer null, \`active\` integer not null default 1, \`created_by_id\` integer null, \`switched_off_at\` datetime null, \`switched_off_by_id\` integer null, constraint \`hold_rules_product_id_foreign\` foreign key(\`product_id\`) references \`products\`(\`id\`) on update cascade, constraint \`hold_rules_created_by_id_foreign\` foreign key(\`created_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade, constraint \`hold_rules_switched_off_by_id_foreign\` foreign key(\`switched_off_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create index \`hold_rules_product_id_index\` on \`hold_rules\` (\`product_id\`);`);
    this.addSql(`create index \`hold_rules_created_by_id_index\` on \`hold_rules\` (\`created_by_id\`);`);
    this.addSql(`create index \`hold_rules_switched_off_by_id_index\` on \`hold_rules\` (\`switched_off_by_id\`);`);
    this.addSql(`create index \`hold_rules_product_id_active_index\` on \`hold_rules\` (\`product_id\`, \`active\`);`);

    this.addSql(`create table \`holds\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`lot_id\` integer not null, \`rule_id\` integer not null, \`run_id\` integer null, \`reason\` text not null, \`figures\` json not null, \`held_at\` datetime not null, \`lifted_at\` datetime null, \`lifted_by_id\` integer null, \`lift_reason\` text null, constraint \`holds_lot_id_foreign\` foreign key(\`lot_id\`) references \`lots\`(\`id\`) on update cascade, constraint \`holds_rule_id_foreign\` foreign key(\`rule_id\`) references \`hold_rules\`(\`id\`) on update cascade, constraint \`holds_run_id_foreign\` foreign key(\`run_id\`) references \`test_runs\`(\`id\`) on delete set null on update cascade, constraint \`holds_lifted_by_id_foreign\` foreign key(\`lifted_by_id\`) references \`users\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create index \`holds_lot_id_index\` on \`holds\` (\`lot_id\`);`);
    this.addSql(`create index \`holds_rule_id_index\` on \`holds\` (\`rule_id\`);`);
    this.addSql(`create index \`holds_run_id_index\` on \`holds\` (\`run_id\`);`);
    this.addSql(`create index \`holds_lifted_by_id_index\` on \`holds\` (\`lifted_by_id\`);`);
    this.addSql(`create index \`holds_lot_id_lifted_at_index\` on \`holds\` (\`lot_id\`, \`lifted_at\`);`);

    this.addSql(`create table \`hold_alerts\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`kind\` text check (\`kind\` in ('hold', 'evaluation_failed')) not null, \`rule_id\` integer null, \`lot_id\` integer null, \`run_id\` integer null, \`hold_id\` integer null, \`message\` text not null, \`figures\` json null, constraint \`hold_alerts_rule_id_foreign\` foreign key(\`rule_id\`) references \`hold_rules\`(\`id\`) on delete set null on update cascade, constraint \`hold_alerts_lot_id_foreign\` foreign key(\`lot_id\`) references \`lots\`(\`id\`) on delete set null on update cascade, constraint \`hold_alerts_run_id_foreign\` foreign key(\`run_id\`) references \`test_runs\`(\`id\`) on delete set null on update cascade);`);
    this.addSql(`create index \`hold_alerts_rule_id_index\` on \`hold_alerts\` (\`rule_id\`);`);
    this.addSql(`create index \`hold_alerts_lot_id_index\` on \`hold_alerts\` (\`lot_id\`);`);
    this.addSql(`create index \`hold_alerts_run_id_index\` on \`hold_alerts\` (\`run_id\`);`);
    this.addSql(`create index \`hold_alerts_created_at_index\` on \`hold_alerts\` (\`created_at\`);`);

    this.addSql(`create table \`outbox_messages\` (\`id\` integer not null primary key autoincrement, \`created_at\` datetime not null, \`updated_at\` datetime not null, \`to_address\` text not null, \`subject\` text not null, \`body\` text not null, \`status\` text check (\`status\` in ('queued', 'sent', 'failed')) not null default 'queued', \`attempts\` integer not null default 0, \`last_error\` text null, \`last_attempt_at\` datetime null, \`sent_at\` datetime null, \`alert_id\` integer null);`);
    this.addSql(`create index \`outbox_messages_status_index\` on \`outbox_messages\` (\`status\`);`);
    this.addSql(`create index \`outbox_messages_created_at_index\` on \`outbox_messages\` (\`created_at\`);`);
  }
}
