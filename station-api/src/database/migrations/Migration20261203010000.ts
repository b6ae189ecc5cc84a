import { Migration } from '@mikro-orm/migrations';

/**
 * Compact measurement storage (issue 11: at most 250 bytes per measurement, captures excluded). Design and
 * figures: docs/storage-design.md.
 *
 * The one wide `measurements` table becomes three physical tables behind a VIEW named `measurements` with the
 * old columns, so every reader keeps its SQL:
 * - `measurement_defs`: what is the same for every unit judged with one plan step and one uncertainty (step,
 *   quantity, names, unit, rule, limits, guarded limits, U). Found by content, so a def is written once and
 *   shared by every run judged with it.
 * - `step_captures`: a raw reading longer than {@link CAPTURE_MIN_CHARS} characters (the ripple and load-step
 *   traces), stored once per run, step and identical text; the load step's three measurements share one.
 * - `measurement_values`: one row per measurement: run, def, value, verdict and decision as small codes, the
 *   short raw JSON text itself or the capture it shares, and its times (created/updated and started as
 *   millisecond offsets from `measured_at`, which are 0 to a few ms and cost one byte).
 * Every stored value reads back through the view exactly as it was stored (the JSON text of `raw` too).
 * INSERTs into the view go through an INSTEAD OF trigger, so one multi-row INSERT is still one statement and
 * one transaction. Ids are kept (the view's `id` is the values table's id; AUTOINCREMENT, never reused).
 */
export const CAPTURE_MIN_CHARS = 257;

const VERDICTS = ['pass', 'fail', 'guard_fail'] as const;
const DECISIONS = ['pass', 'conditional_pass', 'conditional_fail', 'fail'] as const;

/** `case <expr> when 'pass' then 0 … end` and back: codes are the array positions, fixed forever (stored). */
const toCode = (expr: string, names: readonly string[]) => `case ${expr} ${names.map((n, i) => `when '${n}' then ${i}`).join(' ')} end`;
const fromCode = (expr: string, names: readonly string[]) => `case ${expr} ${names.map((n, i) => `when ${i} then '${n}'`).join(' ')} end`;

const DEF_COLUMNS = ['step_index', 'step_key', 'step_name', 'quantity', 'name', 'unit', 'low_limit', 'high_limit', 'guarded_low', 'guarded_high', 'uncertainty', 'rule'];

/** The def whose every column IS the given row's (IS: a null limit matches a null limit). */
const defMatch = (alias: string, row: string) => DEF_COLUMNS.map((c) => `${alias}.\`${c}\` is ${row}.\`${c}\``).join(' and ');

export const CREATE_MEASUREMENT_TABLES = [
  'create table `measurement_defs` (`id` integer not null primary key, `step_index` integer not null, `step_key` text not null, `step_name` text not null, ' +
    '`quantity` text not null, `name` text not null, `unit` text not null, `low_limit` double null, `high_limit` double null, `guarded_low` double null, ' +
    '`guarded_high` double null, `uncertainty` double not null default 0, `rule` text not null);',
  // finds a def by content (the trigger's and the migration's lookup); nulls are distinct in a unique index,
  // so the trigger also checks NOT EXISTS before it adds one. step_index first, on purpose: led by
  // (step_key, quantity) the planner walked the defs in that order to save the GROUP BY sort of a failure
  // Pareto by quantity and looked up the filtered runs once per def (bench:yield 12 -> 155 ms); the defs
  // are few, so readers filtering on step_key and quantity scan them at no cost
  `create unique index \`measurement_defs_content_index\` on \`measurement_defs\` (${DEF_COLUMNS.map((c) => `\`${c}\``).join(', ')});`,
  'create table `step_captures` (`id` integer not null primary key, `run_id` integer not null, `step_index` integer not null, `data` text not null, ' +
    'constraint `step_captures_run_id_foreign` foreign key(`run_id`) references `test_runs`(`id`) on update cascade);',
  'create index `step_captures_run_id_step_index_index` on `step_captures` (`run_id`, `step_index`);',
  'create table `measurement_values` (`id` integer not null primary key autoincrement, `run_id` integer not null, `def_id` integer not null, `value` double null, ' +
    `\`verdict\` integer not null check (\`verdict\` in (0, 1, 2)), \`decision\` integer null check (\`decision\` in (0, 1, 2, 3)), \`raw\` text null, \`capture_id\` integer null, ` +
    '`measured_at` datetime not null, `started_ms_before` integer not null, `created_ms_after` integer not null, `updated_ms_after` integer not null, ' +
    'constraint `measurement_values_run_id_foreign` foreign key(`run_id`) references `test_runs`(`id`) on update cascade, ' +
    'constraint `measurement_values_def_id_foreign` foreign key(`def_id`) references `measurement_defs`(`id`), ' +
    'constraint `measurement_values_capture_id_foreign` foreign key(`capture_id`) references `step_captures`(`id`));',
];

/** The two indexes replacing the old four (docs/storage-design.md has the query plans and timings). */
export const CREATE_MEASUREMENT_INDEXES = [
  // a run's rows (run detail, crash checks, certificate) and one quantity of the filtered runs (capability,
  // control chart, export): the value is in the index, so those read the index alone
  'create index `measurement_values_run_id_def_id_value_index` on `measurement_values` (`run_id`, `def_id`, `value`);',
  // trend of one quantity over time, stations' recent results
  'create index `measurement_values_def_id_measured_at_index` on `measurement_values` (`def_id`, `measured_at`);',
];

export const CREATE_MEASUREMENTS_VIEW =
  'create view `measurements` as select v.`id` as `id`, v.`measured_at` + v.`created_ms_after` as `created_at`, v.`measured_at` + v.`updated_ms_after` as `updated_at`, ' +
  'v.`run_id` as `run_id`, d.`step_index` as `step_index`, d.`step_key` as `step_key`, d.`step_name` as `step_name`, d.`quantity` as `quantity`, d.`name` as `name`, ' +
  'v.`value` as `value`, d.`unit` as `unit`, d.`low_limit` as `low_limit`, d.`high_limit` as `high_limit`, d.`guarded_low` as `guarded_low`, ' +
  'd.`guarded_high` as `guarded_high`, d.`uncertainty` as `uncertainty`, d.`rule` as `rule`, ' +
  `${fromCode('v.`verdict`', VERDICTS)} as \`verdict\`, ` +
  'case when v.`capture_id` is null then v.`raw` else (select c.`data` from `step_captures` c where c.`id` = v.`capture_id`) end as `raw`, ' +
  'v.`measured_at` - v.`started_ms_before` as `started_at`, v.`measured_at` as `measured_at`, ' +
  `${fromCode('v.`decision`', DECISIONS)} as \`decision\` ` +
  'from `measurement_values` v join `measurement_defs` d on d.`id` = v.`def_id`;';

const isCapture = (raw: string) => `length(${raw}) >= ${CAPTURE_MIN_CHARS}`;

/**
 * INSERT into the view: refuses what the old table's constraints refused (and times that are not epoch
 * milliseconds, which the offsets need), adds the def and the capture when new, then the row.
 * Measurements are written once and never changed: UPDATE and DELETE on the view have no trigger, so SQLite
 * refuses them ("cannot modify measurements because it is a view"); the physical tables refuse them by trigger.
 */
export const CREATE_MEASUREMENT_TRIGGERS = [
  'create trigger `measurements_insert` instead of insert on `measurements` begin ' +
    `select raise(abort, 'measurement verdict must be pass, fail or guard_fail') where new.\`verdict\` is null or new.\`verdict\` not in (${VERDICTS.map((v) => `'${v}'`).join(', ')}); ` +
    `select raise(abort, 'measurement decision must be empty or pass, conditional_pass, conditional_fail, fail') where new.\`decision\` is not null and new.\`decision\` not in (${DECISIONS.map((v) => `'${v}'`).join(', ')}); ` +
    "select raise(abort, 'measurement times (created_at, updated_at, started_at, measured_at) must be epoch milliseconds') " +
    "where typeof(new.`measured_at`) not in ('integer', 'real') or typeof(new.`started_at`) not in ('integer', 'real') " +
    "or typeof(new.`created_at`) not in ('integer', 'real') or typeof(new.`updated_at`) not in ('integer', 'real'); " +
    `insert into \`measurement_defs\` (${DEF_COLUMNS.map((c) => `\`${c}\``).join(', ')}) ` +
    `select ${DEF_COLUMNS.map((c) => (c === 'uncertainty' ? 'coalesce(new.`uncertainty`, 0)' : `new.\`${c}\``)).join(', ')} ` +
    `where not exists (select 1 from \`measurement_defs\` d where ${defMatch('d', 'new').replace('new.`uncertainty`', 'coalesce(new.`uncertainty`, 0)')}); ` +
    'insert into `step_captures` (`run_id`, `step_index`, `data`) select new.`run_id`, new.`step_index`, new.`raw` ' +
    `where ${isCapture('new.`raw`')} and not exists (select 1 from \`step_captures\` c where c.\`run_id\` = new.\`run_id\` and c.\`step_index\` = new.\`step_index\` and c.\`data\` = new.\`raw\`); ` +
    'insert into `measurement_values` (`id`, `run_id`, `def_id`, `value`, `verdict`, `decision`, `raw`, `capture_id`, `measured_at`, `started_ms_before`, `created_ms_after`, `updated_ms_after`) ' +
    `values (new.\`id\`, new.\`run_id\`, (select d.\`id\` from \`measurement_defs\` d where ${defMatch('d', 'new').replace('new.`uncertainty`', 'coalesce(new.`uncertainty`, 0)')}), ` +
    `new.\`value\`, ${toCode('new.`verdict`', VERDICTS)}, ${toCode('new.`decision`', DECISIONS)}, ` +
    `case when ${isCapture('new.`raw`')} then null else new.\`raw\` end, ` +
    `case when ${isCapture('new.`raw`')} then (select c.\`id\` from \`step_captures\` c where c.\`run_id\` = new.\`run_id\` and c.\`step_index\` = new.\`step_index\` and c.\`data\` = new.\`raw\`) end, ` +
    'new.`measured_at`, new.`measured_at` - new.`started_at`, new.`created_at` - new.`measured_at`, new.`updated_at` - new.`measured_at`); ' +
    'end;',
  ...['measurement_values', 'measurement_defs', 'step_captures'].flatMap((t) => [
    `create trigger \`${t}_no_update\` before update on \`${t}\` begin select raise(abort, 'stored measurements cannot be changed; a correction is a new record'); end;`,
    `create trigger \`${t}_no_delete\` before delete on \`${t}\` begin select raise(abort, 'stored measurements cannot be deleted'); end;`,
  ]),
];

export class Migration20261203010000 extends Migration {
  override async up(): Promise<void> {
    for (const s of CREATE_MEASUREMENT_TABLES) this.addSql(s);
    // the old rows' times must be numbers for the offsets; the ORM always wrote epoch milliseconds, so this only
    // stops an upgrade of a hand-edited file (with a message naming what to fix) instead of changing a time
    this.addSql(
      'create temp trigger `measurements_upgrade_check` before insert on `measurement_values` when new.`started_ms_before` is null or new.`created_ms_after` is null ' +
        "or new.`updated_ms_after` is null begin select raise(abort, 'a stored measurement has a time that is not epoch milliseconds; upgrade refused, nothing changed'); end;",
    );
    this.addSql(`insert into \`measurement_defs\` (${DEF_COLUMNS.map((c) => `\`${c}\``).join(', ')}) select distinct ${DEF_COLUMNS.map((c) => `\`${c}\``).join(', ')} from \`measurements\` order by \`step_key\`, \`quantity\`;`);
    this.addSql(
      'insert into `step_captures` (`run_id`, `step_index`, `data`) select `run_id`, `step_index`, `raw` from `measurements` ' +
        `where ${isCapture('`raw`')} group by \`run_id\`, \`step_index\`, \`raw\` order by min(\`id\`);`,
    );
    this.addSql(
      'insert into `measurement_values` (`id`, `run_id`, `def_id`, `value`, `verdict`, `decision`, `raw`, `capture_id`, `measured_at`, `started_ms_before`, `created_ms_after`, `updated_ms_after`) ' +
        `select m.\`id\`, m.\`run_id\`, (select d.\`id\` from \`measurement_defs\` d where ${defMatch('d', 'm')}), m.\`value\`, ${toCode('m.`verdict`', VERDICTS)}, ${toCode('m.`decision`', DECISIONS)}, ` +
        `case when ${isCapture('m.`raw`')} then null else m.\`raw\` end, ` +
        `case when ${isCapture('m.`raw`')} then (select c.\`id\` from \`step_captures\` c where c.\`run_id\` = m.\`run_id\` and c.\`step_index\` = m.\`step_index\` and c.\`data\` = m.\`raw\`) end, ` +
        'm.`measured_at`, ' +
        ["m.`measured_at` - m.`started_at`", 'm.`created_at` - m.`measured_at`', 'm.`updated_at` - m.`measured_at`']
          .map((e) => `case when typeof(m.\`measured_at\`) in ('integer', 'real') and typeof(m.\`started_at\`) in ('integer', 'real') and typeof(m.\`created_at\`) in ('integer', 'real') and typeof(m.\`updated_at\`) in ('integer', 'real') then ${e} end`)
          .join(', ') +
        ' from `measurements` m order by m.`id`;',
    );
    // ids are never reused: the new table continues the old one's AUTOINCREMENT counter
    this.addSql(
      "update `sqlite_sequence` set `seq` = max(`seq`, coalesce((select `seq` from `sqlite_sequence` where `name` = 'measurements'), 0)) where `name` = 'measurement_values';",
    );
    this.addSql(
      "insert into `sqlite_sequence` (`name`, `seq`) select 'measurement_values', `seq` from `sqlite_sequence` where `name` = 'measurements' " +
        "and not exists (select 1 from `sqlite_sequence` where `name` = 'measurement_values');",
    );
    this.addSql('drop trigger `measurements_upgrade_check`;');
    this.addSql('drop table `measurements`;');
    for (const s of CREATE_MEASUREMENT_INDEXES) this.addSql(s);
    this.addSql(CREATE_MEASUREMENTS_VIEW);
    for (const s of CREATE_MEASUREMENT_TRIGGERS) this.addSql(s);
  }

  override async down(): Promise<void> {
    // back to the one wide table of Migration20261202155000, every row as the view shows it
    this.addSql(
      'create table `measurements_wide` (`id` integer not null primary key autoincrement, `created_at` datetime not null, `updated_at` datetime not null, `run_id` integer not null, ' +
        '`step_index` integer not null, `step_key` text not null, `step_name` text not null, `quantity` text not null, `name` text not null, `value` double null, `unit` text not null, ' +
        '`low_limit` double null, `high_limit` double null, `guarded_low` double null, `guarded_high` double null, `uncertainty` double not null default 0, `rule` text not null, ' +
        "`verdict` text check (`verdict` in ('pass', 'fail', 'guard_fail')) not null, `raw` json null, `started_at` datetime not null, `measured_at` datetime not null, `decision` text null, " +
        'constraint `measurements_run_id_foreign` foreign key(`run_id`) references `test_runs`(`id`) on update cascade);',
    );
    this.addSql('insert into `measurements_wide` select * from `measurements` order by `id`;');
    this.addSql('drop view `measurements`;');
    for (const t of ['measurement_values', 'measurement_defs', 'step_captures']) {
      this.addSql(`drop trigger \`${t}_no_update\`;`);
      this.addSql(`drop trigger \`${t}_no_delete\`;`);
    }
    this.addSql('drop table `measurement_values`;');
    this.addSql('drop table `step_captures`;');
    this.addSql('drop table `measurement_defs`;');
    this.addSql('alter table `measurements_wide` rename to `measurements`;');
    this.addSql('create index `measurements_run_id_index` on `measurements` (`run_id`);');
    this.addSql('create index `measurements_step_key_measured_at_index` on `measurements` (`step_key`, `measured_at`);');
    this.addSql('create index `measurements_step_key_quantity_measured_at_index` on `measurements` (`step_key`, `quantity`, `measured_at`);');
    this.addSql('create index `measurements_run_id_step_key_quantity_value_index` on `measurements` (`run_id`, `step_key`, `quantity`, `value`);');
  }
}
