import type { MeasurementView, RunView } from '../realtime/station-events';
import { toMeasurementView, toRunView } from './run-views';

/*
 * The run list and one run, read with hand-written SQL: only the columns a RunView shows, one row per run,
 * no entity hydration. The ORM's populate of eight relations read about 110 columns a row (the plan's steps
 * JSON and every user's password hash among them) and cost ~10x the SQL (issue 11, docs/performance.md).
 */

/** The columns of a RunView; `users` is read for the display name only, never the password hash. */
export const RUN_VIEW_SELECT =
  'select r.id, r.attempt, r.verdict, r.started_at, r.finished_at, r.failed_step_key, r.error_message, r.end_reason, ' +
  'r.fixture_identity, r.fixture_calibration_due_at, r.fixture_contact_cycles, r.override_reason, r.operator_name, ' +
  'r.station_id, s.code as station_code, r.unit_id, u.serial, r.lot_id, l.code as lot_code, r.product_id, p.part_number, ' +
  'r.plan_version_id, pv.version as plan_version, pv.checksum as plan_checksum, tp.code as plan_code, r.fixture_id, f.code as fixture_code, ' +
  'r.operator_id, op.display_name as operator_display_name, r.override_by_id, ob.display_name as override_by_display_name ' +
  'from test_runs r ' +
  'join stations s on s.id = r.station_id ' +
  'join units u on u.id = r.unit_id ' +
  'join lots l on l.id = r.lot_id ' +
  'join products p on p.id = r.product_id ' +
  'join plan_versions pv on pv.id = r.plan_version_id ' +
  'join test_plans tp on tp.id = pv.plan_id ' +
  'join fixtures f on f.id = r.fixture_id ' +
  'join users op on op.id = r.operator_id ' +
  'left join users ob on ob.id = r.override_by_id';

export interface RunFilter {
  stationId?: number;
  lotId?: number;
  /** any part of the serial, any case */
  serial?: string;
  verdict?: string;
  from?: string;
  to?: string;
}

/** Columns the runs list may be sorted by, each mapped to its SQL on RUN_VIEW_SELECT's aliases (a whitelist). */
export const RUN_SORTS = {
  startedAt: 'r.started_at',
  serial: 'u.serial collate nocase',
  product: 'p.part_number collate nocase',
  lot: 'l.code collate nocase',
  station: 's.code collate nocase',
  fixture: 'f.code collate nocase',
  operator: 'coalesce(r.operator_name, op.display_name) collate nocase',
  attempt: 'r.attempt',
  plan: 'tp.code collate nocase',
  verdict: 'r.verdict',
  failedStep: 'r.failed_step_key',
  duration: '(r.finished_at - r.started_at)',
} as const;
export type RunSort = keyof typeof RUN_SORTS;
export const RUN_SORT_KEYS = Object.keys(RUN_SORTS) as RunSort[];

/**
 * ORDER BY for a whitelisted column; newest first by default. Ties go newest first by id so pages never
 * overlap; empty values (a run still going has no duration) go last either way.
 */
export function runOrderSql(sort: RunSort = 'startedAt', dir: 'asc' | 'desc' = 'desc'): string {
  const col = RUN_SORTS[sort];
  const bare = col.replace(/ collate nocase$/, '');
  const extra = sort === 'plan' ? `, pv.version ${dir}` : '';
  // only the columns that may be empty get the "empty last" term: in front of a column that never is, it kept
  // the planner from reading the order from an index (issue 11)
  const emptyLast = NULLABLE_SORTS.has(sort) ? `case when ${bare} is null then 1 else 0 end, ` : '';
  // newest first breaks ties; sorted by start time, only the id is left to break them (a repeated started_at term
  // made the planner sort every run for a page of 50: 11 ms against 1 ms at 100,000 runs, bench:floor)
  const ties = sort === 'startedAt' ? 'r.id desc' : 'r.started_at desc, r.id desc';
  return ` order by ${emptyLast}${col} ${dir}${extra}, ${ties}`;
}

/** Sort columns that may be empty: a run without a failed step, a run still going (no duration). */
const NULLABLE_SORTS = new Set<RunSort>(['failedStep', 'duration']);

/** Every verdict a run may hold, in the order SQLite sorts them (binary text); a spec checks it against the DTO. */
export const RUN_VERDICTS_SORTED = ['aborted', 'error', 'fail', 'pass', 'running'] as const;

/**
 * The name of a failed step as the plan version the run used names it (a key the plan does not know stays
 * without a name). The versions' steps are read once per listed page, not once per row.
 */
export function failedStepNames(rows: { id: number; planVersionId: number; failedStepKey: string | null }[], steps: Map<number, { key: string; name: string }[]>): Map<number, string> {
  const names = new Map<number, string>();
  for (const r of rows) {
    if (r.failedStepKey === null) continue;
    const step = steps.get(r.planVersionId)?.find((s) => s.key === r.failedStepKey);
    if (step) names.set(r.id, step.name);
  }
  return names;
}

/** `%`, `_` and the escape character itself match literally in a serial search. */
export function likePattern(part: string): string {
  return `%${part.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/**
 * The WHERE clause of a run filter on `test_runs r`, without joins: the serial goes through a sub-select on
 * units, so the COUNT reads test_runs (and its indexes) alone.
 */
export function runFilterSql(q: RunFilter): { where: string; clauses: string[]; params: unknown[] } {
  const clauses: string[] = [];
  const params: unknown[] = [];
  if (q.stationId) {
    clauses.push('r.station_id = ?');
    params.push(q.stationId);
  }
  if (q.lotId) {
    clauses.push('r.lot_id = ?');
    params.push(q.lotId);
  }
  if (q.verdict) {
    clauses.push('r.verdict = ?');
    params.push(q.verdict);
  }
  if (q.serial) {
    // LIKE is case-insensitive for ASCII in SQLite, which is every character a serial may hold
    clauses.push("r.unit_id in (select id from units where serial like ? escape '\\')");
    params.push(likePattern(q.serial.trim()));
  }
  // dates are stored as epoch milliseconds (the ORM's SQLite mapping)
  if (q.from) {
    clauses.push('r.started_at >= ?');
    params.push(new Date(q.from).getTime());
  }
  if (q.to) {
    clauses.push('r.started_at < ?');
    params.push(new Date(q.to).getTime());
  }
  return { where: clauses.length ? ` where ${clauses.join(' and ')}` : '', clauses, params };
}

/** A stored date: epoch milliseconds as the ORM writes them (or text from a hand-made row). */
function toDate(v: unknown): Date | null {
  if (v === null || v === undefined) return null;
  return new Date(typeof v === 'string' && !/^\d+$/.test(v) ? v : Number(v));
}

/** One row of {@link RUN_VIEW_SELECT} as the run view every route shows. */
export function rowToRunView(row: Record<string, unknown>): RunView {
  const n = (k: string) => Number(row[k]);
  const s = (k: string) => (row[k] === null || row[k] === undefined ? null : String(row[k]));
  return toRunView({
    id: n('id'),
    station: { id: n('station_id'), code: String(row.station_code) },
    unit: { id: n('unit_id'), serial: String(row.serial) },
    lot: { id: n('lot_id'), code: String(row.lot_code) },
    product: { id: n('product_id'), partNumber: String(row.part_number) },
    planVersion: { id: n('plan_version_id'), version: n('plan_version'), checksum: String(row.plan_checksum), plan: { code: String(row.plan_code) } },
    operator: { id: n('operator_id'), displayName: String(row.operator_display_name) },
    operatorName: s('operator_name'),
    fixture: { id: n('fixture_id'), code: String(row.fixture_code) },
    attempt: n('attempt'),
    verdict: String(row.verdict),
    startedAt: toDate(row.started_at)!,
    finishedAt: toDate(row.finished_at),
    failedStepKey: s('failed_step_key'),
    errorMessage: s('error_message'),
    endReason: s('end_reason'),
    fixtureIdentity: s('fixture_identity'),
    fixtureCalibrationDueAt: toDate(row.fixture_calibration_due_at),
    fixtureContactCycles: row.fixture_contact_cycles === null || row.fixture_contact_cycles === undefined ? null : n('fixture_contact_cycles'),
    overrideReason: s('override_reason'),
    overrideBy: row.override_by_id === null || row.override_by_id === undefined ? null : { id: n('override_by_id'), displayName: String(row.override_by_display_name) },
  });
}

/** The columns of a MeasurementView. */
export const MEASUREMENT_VIEW_SELECT =
  'select id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, guarded_low, guarded_high, ' +
  'uncertainty, rule, verdict, decision, raw, started_at, measured_at from measurements';

/** One row of {@link MEASUREMENT_VIEW_SELECT} as the measurement view (raw JSON parsed, dates from epoch ms). */
export function rowToMeasurementView(row: Record<string, unknown>, runId: number): MeasurementView {
  const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  return toMeasurementView(
    {
      id: Number(row.id),
      stepIndex: Number(row.step_index),
      stepKey: String(row.step_key),
      stepName: String(row.step_name),
      quantity: String(row.quantity),
      name: String(row.name),
      value: num(row.value),
      unit: String(row.unit),
      lowLimit: num(row.low_limit),
      highLimit: num(row.high_limit),
      guardedLow: num(row.guarded_low),
      guardedHigh: num(row.guarded_high),
      uncertainty: Number(row.uncertainty),
      rule: String(row.rule),
      verdict: String(row.verdict),
      decision: row.decision === null || row.decision === undefined ? null : String(row.decision),
      raw: typeof row.raw === 'string' ? (JSON.parse(row.raw) as Record<string, unknown>) : ((row.raw as Record<string, unknown> | null) ?? null),
      startedAt: toDate(row.started_at)!,
      measuredAt: toDate(row.measured_at)!,
    },
    runId,
  );
}
