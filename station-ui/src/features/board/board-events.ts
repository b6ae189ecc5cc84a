import type { RunFinishedPayload, RunStartedPayload, StationStatePayload, StepStartedPayload } from '@station-events';
import type { BoardStation } from './api/get-board';

/** How many past verdicts a tile keeps when events add new ones. */
export const LAST_RUNS_KEPT = 12;

type Patch = (tile: BoardStation) => BoardStation;

function patchStation(board: BoardStation[], stationId: number, patch: Patch): BoardStation[] {
  let hit = false;
  const next = board.map((t) => {
    if (t.station.id !== stationId) return t;
    hit = true;
    return patch(t);
  });
  return hit ? next : board;
}

export function boardWithState(board: BoardStation[], p: StationStatePayload): BoardStation[] {
  return patchStation(board, p.stationId, (t) => ({
    ...t,
    state: p.state,
    reasons: p.reasons,
    // a station no longer testing has no current unit, even if its run:finished was missed
    currentRun: p.state === 'testing' ? t.currentRun : null,
  }));
}

export function boardWithRunStarted(board: BoardStation[], p: RunStartedPayload): BoardStation[] {
  return patchStation(board, p.stationId, (t) => ({
    ...t,
    state: 'testing',
    currentRun: {
      id: p.run.id,
      serial: p.run.serial,
      stepIndex: 0,
      stepCount: p.steps.length,
      stepName: p.steps[0]?.name ?? '',
      startedAt: p.run.startedAt,
      stepNames: p.steps.map((s) => s.name),
    },
  }));
}

/**
 * @param stepNames names of the run's steps from its `run:started` (a refetched board has none), so the
 *   tile can name the step; without them the step key is shown
 */
export function boardWithStepStarted(board: BoardStation[], p: StepStartedPayload, stepNames?: readonly string[]): BoardStation[] {
  return patchStation(board, p.stationId, (t) => {
    if (!t.currentRun || t.currentRun.id !== p.runId) return t;
    const names = stepNames ?? t.currentRun.stepNames;
    return { ...t, currentRun: { ...t.currentRun, stepIndex: p.stepIndex, stepName: names?.[p.stepIndex] ?? p.stepKey } };
  });
}

export function boardWithRunFinished(board: BoardStation[], p: RunFinishedPayload, nowIso: string = new Date().toISOString()): BoardStation[] {
  return patchStation(board, p.stationId, (t) => {
    if (t.lastRuns.some((r) => r.id === p.runId)) return { ...t, currentRun: null };
    const serial = t.currentRun?.id === p.runId ? t.currentRun.serial : p.unit?.serial ?? '';
    return {
      ...t,
      currentRun: t.currentRun?.id === p.runId ? null : t.currentRun,
      lastRuns: [{ id: p.runId, serial, verdict: p.verdict, failedStepKey: p.failedStepKey ?? null, finishedAt: nowIso }, ...t.lastRuns].slice(
        0,
        Math.max(LAST_RUNS_KEPT, t.lastRuns.length),
      ),
    };
  });
}
