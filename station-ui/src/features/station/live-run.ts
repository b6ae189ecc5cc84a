import type {
  MeasurementJudgedPayload,
  MeasurementView,
  RunFinishedPayload,
  RunStartedPayload,
  RunView,
  StepOutline,
  StepStartedPayload,
  UnitView,
} from '@station-events';
import type { RunDetail } from './api/get-run';

export type FinishedVerdict = RunFinishedPayload['verdict'];

/** How a run ended, as `run:finished` (or the stored run) tells it. */
export interface FinishedRun {
  verdict: FinishedVerdict;
  failedStepKey?: string;
  /** Every measurement that did not pass, in order */
  failures: MeasurementView[];
  errorMessage?: string;
  durationMs: number;
}

/**
 * The run on the operator's screen, as it lives in the query cache: the plan's steps laid out at the start,
 * the values filled in as `measurement:judged` events arrive. Only socket events and the REST reload
 * write it (hooks/use-station-live.ts); components only read it.
 */
export interface LiveRun {
  run: RunView;
  unit: UnitView;
  steps: StepOutline[];
  /** Judged values by {@link measurementKey} */
  measurements: Record<string, MeasurementView>;
  /** Server emit time (ms since epoch) per judged value that arrived live, for the paint-latency figure */
  emittedAtMs: Record<string, number>;
  /** Index of the step the fixture is working on; null before the first step */
  currentStepIndex: number | null;
  /** When this screen learnt of the run (ms since epoch, this computer's clock), for the elapsed time */
  seenAtMs: number;
  finished: FinishedRun | null;
}

/** A measurement's place in the step list: its step and its limit key. */
export const measurementKey = (stepKey: string, quantity: string): string => `${stepKey}|${quantity}`;

/** The run as `run:started` announces it: every step laid out, nothing measured yet. */
export function runFromStarted(p: RunStartedPayload, nowMs: number = Date.now()): LiveRun {
  return {
    run: p.run,
    unit: p.unit,
    steps: p.steps,
    measurements: {},
    emittedAtMs: {},
    currentStepIndex: null,
    seenAtMs: nowMs,
    finished: null,
  };
}

/** A run whose start this screen saw only by the REST answer (the event may come later or was missed). */
export function runFromStartAnswer(run: RunView, unit: UnitView, steps: StepOutline[], nowMs: number = Date.now()): LiveRun {
  return runFromStarted({ run, unit, steps, stationId: run.stationId, emittedAt: nowMs }, nowMs);
}

export function withStepStarted(live: LiveRun, p: StepStartedPayload): LiveRun {
  if (live.run.id !== p.runId || live.finished) return live;
  return { ...live, currentStepIndex: p.stepIndex };
}

export function withMeasurement(live: LiveRun, p: MeasurementJudgedPayload): LiveRun {
  if (live.run.id !== p.runId) return live;
  const key = measurementKey(p.measurement.stepKey, p.measurement.quantity);
  // a measurement is never altered once stored: a repeated event changes nothing
  if (live.measurements[key]?.id === p.measurement.id) return live;
  return {
    ...live,
    measurements: { ...live.measurements, [key]: p.measurement },
    emittedAtMs: { ...live.emittedAtMs, [key]: p.emittedAt },
    currentStepIndex: Math.max(live.currentStepIndex ?? 0, p.measurement.stepIndex),
  };
}

export function withFinished(live: LiveRun, p: RunFinishedPayload): LiveRun {
  if (live.run.id !== p.runId) return live;
  // failures carry their measurements: a value whose event was missed still shows in its row
  const measurements = { ...live.measurements };
  for (const m of p.failures) measurements[measurementKey(m.stepKey, m.quantity)] ??= m;
  return {
    ...live,
    unit: p.unit ?? live.unit,
    measurements,
    run: { ...live.run, verdict: p.verdict, durationMs: p.durationMs, failedStepKey: p.failedStepKey ?? null, errorMessage: p.errorMessage ?? null },
    finished: {
      verdict: p.verdict,
      failedStepKey: p.failedStepKey,
      failures: p.failures,
      errorMessage: p.errorMessage,
      durationMs: p.durationMs,
    },
  };
}

/**
 * The run as the server stored it (after a reload or a lost live link). Live emit times already known
 * are kept, so the latency figure does not lose samples.
 */
export function runFromDetail(detail: RunDetail, unit: UnitView, known?: LiveRun | null, nowMs: number = Date.now()): LiveRun {
  const { measurements: list, steps, ...run } = detail;
  const measurements: Record<string, MeasurementView> = {};
  for (const m of list) measurements[measurementKey(m.stepKey, m.quantity)] = m;
  const lastIndex = list.reduce((max, m) => Math.max(max, m.stepIndex), -1);
  const sameRun = known && known.run.id === run.id;
  const finished: FinishedRun | null =
    run.verdict === 'running'
      ? null
      : {
          verdict: run.verdict,
          failedStepKey: run.failedStepKey ?? undefined,
          failures: list.filter((m) => m.verdict !== 'pass'),
          errorMessage: run.errorMessage ?? undefined,
          durationMs: run.durationMs ?? 0,
        };
  return {
    run,
    unit,
    steps,
    measurements,
    emittedAtMs: sameRun ? known.emittedAtMs : {},
    currentStepIndex: sameRun && known.currentStepIndex !== null ? Math.max(known.currentStepIndex, lastIndex) : lastIndex >= 0 ? lastIndex : null,
    seenAtMs: sameRun ? known.seenAtMs : Date.parse(run.startedAt) || nowMs,
    finished,
  };
}

/**
 * Joins a run fetched from the server with the same run as live events have been writing it meanwhile:
 * events that arrived while the fetch was under way must not be lost. Measurements are never altered
 * once stored, so the union by place is safe; a finish seen by either side stands.
 */
export function mergeLiveRuns(fetched: LiveRun, cached: LiveRun | null | undefined): LiveRun {
  if (!cached || cached.run.id !== fetched.run.id) return fetched;
  const finished = cached.finished ?? fetched.finished;
  const step = Math.max(fetched.currentStepIndex ?? -1, cached.currentStepIndex ?? -1);
  return {
    ...fetched,
    run: cached.finished ? cached.run : fetched.run,
    unit: cached.unit,
    steps: fetched.steps.length > 0 ? fetched.steps : cached.steps,
    measurements: { ...fetched.measurements, ...cached.measurements },
    emittedAtMs: { ...fetched.emittedAtMs, ...cached.emittedAtMs },
    currentStepIndex: step >= 0 ? step : null,
    seenAtMs: cached.seenAtMs,
    finished,
  };
}

/** What a row of the step list shows in its result column. */
export type StepStatus = 'waiting' | 'measuring' | 'pass' | 'fail' | 'guard_fail' | 'not_run';

/** The judged verdict of one step: its worst measurement (fail before guard-band fail before pass). */
function worst(ms: MeasurementView[]): 'pass' | 'fail' | 'guard_fail' {
  if (ms.some((m) => m.verdict === 'fail')) return 'fail';
  if (ms.some((m) => m.verdict === 'guard_fail')) return 'guard_fail';
  return 'pass';
}

export function stepStatus(live: LiveRun, index: number): StepStatus {
  const step = live.steps[index];
  if (!step) return 'waiting';
  const got = step.limits.map((l) => live.measurements[measurementKey(step.key, l.key)]).filter((m): m is MeasurementView => !!m);
  if (got.length === step.limits.length && got.length > 0) return worst(got);
  if (live.finished) return got.length > 0 ? worst(got) : 'not_run';
  if (live.currentStepIndex === index || got.length > 0) return 'measuring';
  return 'waiting';
}

/** The status of one limit's row. */
export function limitStatus(live: LiveRun, stepIndex: number, limitKey: string): StepStatus {
  const step = live.steps[stepIndex];
  if (!step) return 'waiting';
  const m = live.measurements[measurementKey(step.key, limitKey)];
  if (m) return m.verdict;
  if (live.finished) return 'not_run';
  return live.currentStepIndex === stepIndex ? 'measuring' : 'waiting';
}

/** Steps whose every limit has been judged. */
export function completedSteps(live: LiveRun): number {
  return live.steps.filter((s) => s.limits.length > 0 && s.limits.every((l) => live.measurements[measurementKey(s.key, l.key)])).length;
}

/** Share of the run done, 0…1: whole steps, plus a part for the step under way. */
export function progressFraction(live: LiveRun): number {
  if (live.steps.length === 0) return live.finished ? 1 : 0;
  if (live.finished?.verdict === 'pass' || live.finished?.verdict === 'fail') return 1;
  return Math.min(1, completedSteps(live) / live.steps.length);
}
