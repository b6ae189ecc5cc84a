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
    warnings: p.warnings ?? [],
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

/** What the board learnt from a run's `run:started`, kept by the live hook outside the cached board. */
export interface StartedRunInfo {
  serial: string;
  startedAt: string;
  stepNames: readonly string[];
}

/**
 * @param info the run's `run:started` facts: names the step, and rebuilds the unit under test when a
 *   refetched board (answered just before the run began) has none
 */
export function boardWithStepStarted(board: BoardStation[], p: StepStartedPayload, info?: StartedRunInfo): BoardStation[] {
  return patchStation(board, p.stationId, (t) => {
    const current =
      t.currentRun && t.currentRun.id === p.runId
        ? t.currentRun
        : info
          ? { id: p.runId, serial: info.serial, stepIndex: 0, stepCount: info.stepNames.length, stepName: null, startedAt: info.startedAt }
          : null;
    if (!current) return t;
    const names = info?.stepNames ?? current.stepNames;
    return { ...t, state: 'testing', currentRun: { ...current, stepIndex: p.stepIndex, stepName: names?.[p.stepIndex] ?? p.stepKey } };
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
