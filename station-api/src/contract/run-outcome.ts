/*
 * How a run ended and how a measurement was decided, with the words people read for them. One list for the
 * server (entities, views) and the screens (through the `@contract/*` alias). Pure TypeScript, no imports.
 */

/**
 * Why a run ended without a judged verdict (`test_runs.end_reason`); null for a judged run.
 * interrupted: found `running` at start-up (crash recovery).
 */
export const END_REASONS = [
  'operator_stop',
  'server_shutdown',
  'interrupted',
  'fixture_fault',
  'software_fault',
  'implausible_reading',
  'store_failed',
] as const;

export type EndReason = (typeof END_REASONS)[number];

/** Each end reason in plain words, for the Runs screens and the station. */
export const END_REASON_WORDS: Record<EndReason, string> = {
  operator_stop: 'stopped by the operator',
  server_shutdown: 'station server shut down',
  interrupted: 'interrupted: the station server stopped during the run',
  fixture_fault: 'fixture fault',
  software_fault: 'software fault',
  implausible_reading: 'implausible reading',
  store_failed: 'result could not be stored',
};

/** Null for a judged run or a reason this build does not know (shown as the error message only). */
export function endReasonWords(reason: string | null | undefined): string | null {
  return reason && reason in END_REASON_WORDS ? END_REASON_WORDS[reason as EndReason] : null;
}

/**
 * The decision statement kept with each measurement: ILAC-G8:09/2019 §4.2.3, non-binary statement
 * (conditional pass/fail when the value lies within the expanded uncertainty of a limit).
 */
export const DECISIONS = ['pass', 'conditional_pass', 'conditional_fail', 'fail'] as const;

export type Decision = (typeof DECISIONS)[number];

export const DECISION_WORDS: Record<Decision, string> = {
  pass: 'pass',
  conditional_pass: 'pass, within uncertainty',
  conditional_fail: 'fail, within uncertainty',
  fail: 'fail',
};

/** Null when no statement is stored (runs recorded before decisions were kept) or the value is unknown. */
export function decisionWords(decision: string | null | undefined): string | null {
  return decision && decision in DECISION_WORDS ? DECISION_WORDS[decision as Decision] : null;
}

/**
 * The one word for a stopped run on every screen, the station's verdict and the office screens alike (issue 12):
 * the verdict value `aborted` stays in the database and the API; people read "Stopped".
 */
export const STOPPED_WORD = 'Stopped';

/** The word for each run verdict on every screen: `aborted` stays the API value, people read {@link STOPPED_WORD}. */
export const RUN_VERDICT_WORDS = {
  running: 'testing',
  pass: 'pass',
  fail: 'fail',
  error: 'error',
  aborted: STOPPED_WORD,
} as const satisfies Record<'running' | 'pass' | 'fail' | 'error' | 'aborted', string>;

export type RunVerdictWord = (typeof RUN_VERDICT_WORDS)[keyof typeof RUN_VERDICT_WORDS];
