import { describe, expect, it } from 'vitest';
import {
  completedSteps,
  mergeLiveRuns,
  limitStatus,
  progressFraction,
  runFromDetail,
  runFromStarted,
  stepStatus,
  withFinished,
  withMeasurement,
  withStepStarted,
} from './live-run';
import { measurementFor, sampleRun, sampleSteps, sampleUnit } from './test-data';

const started = () => runFromStarted({ stationId: 1, emittedAt: 1, run: sampleRun, unit: sampleUnit, steps: sampleSteps }, 5_000);
const judged = (m: ReturnType<typeof measurementFor>, emittedAt = 10) => ({ stationId: 1, emittedAt, runId: sampleRun.id, stepKey: m.stepKey, measurement: m });

describe('live run model', () => {
  it('lays every step out before any value arrives', () => {
    const live = started();
    expect(live.steps).toHaveLength(3);
    expect(sampleSteps.map((_, i) => stepStatus(live, i))).toEqual(['waiting', 'waiting', 'waiting']);
    expect(progressFraction(live)).toBe(0);
  });

  it('marks the step under way, then fills values in as they are judged', () => {
    let live = withStepStarted(started(), { stationId: 1, emittedAt: 2, runId: sampleRun.id, stepKey: 'iin-no-load', stepIndex: 0 });
    expect(stepStatus(live, 0)).toBe('measuring');
    live = withMeasurement(live, judged(measurementFor(0, 'iinNoLoadMa', 8.2), 1234));
    expect(stepStatus(live, 0)).toBe('pass');
    expect(live.emittedAtMs['iin-no-load|iinNoLoadMa']).toBe(1234);
    live = withMeasurement(live, judged(measurementFor(1, 'voutV@1.5', 5.0)));
    expect(stepStatus(live, 1)).toBe('measuring');
    expect(limitStatus(live, 1, 'voutV@3')).toBe('measuring');
    live = withMeasurement(live, judged(measurementFor(1, 'voutV@3', 5.095, 'guard_fail')));
    // the worst measurement decides the step
    expect(stepStatus(live, 1)).toBe('guard_fail');
    expect(completedSteps(live)).toBe(2);
    expect(progressFraction(live)).toBeCloseTo(2 / 3, 12);
  });

  it('ignores events of another run and repeated events', () => {
    const live = started();
    const m = measurementFor(0, 'iinNoLoadMa', 8.2);
    expect(withMeasurement(live, { ...judged(m), runId: 999 })).toBe(live);
    const once = withMeasurement(live, judged(m));
    expect(withMeasurement(once, judged(m))).toBe(once);
  });

  it('finishes: steps never reached show "not run", failures are kept', () => {
    let live = withMeasurement(started(), judged(measurementFor(0, 'iinNoLoadMa', 22.5, 'fail')));
    const failure = live.measurements['iin-no-load|iinNoLoadMa']!;
    live = withFinished(live, {
      stationId: 1,
      emittedAt: 3,
      runId: sampleRun.id,
      verdict: 'fail',
      failedStepKey: 'iin-no-load',
      failures: [failure],
      durationMs: 4_200,
      unit: { ...sampleUnit, state: 'failed', testCount: 1 },
    });
    expect(live.finished?.verdict).toBe('fail');
    expect(stepStatus(live, 0)).toBe('fail');
    expect(stepStatus(live, 1)).toBe('not_run');
    expect(live.unit.state).toBe('failed');
    expect(progressFraction(live)).toBe(1);
  });

  it('rebuilds from the stored run after a reload, keeping live emit times', () => {
    const m = measurementFor(0, 'iinNoLoadMa', 8.2);
    const known = withMeasurement(started(), judged(m, 777));
    const again = runFromDetail({ ...sampleRun, measurements: [m], steps: sampleSteps }, sampleUnit, known);
    expect(again.emittedAtMs['iin-no-load|iinNoLoadMa']).toBe(777);
    expect(again.finished).toBeNull();
    expect(again.currentStepIndex).toBe(0);
    const done = runFromDetail({ ...sampleRun, verdict: 'error', errorMessage: 'Fixture FX-101 did not answer', durationMs: 900, measurements: [m], steps: sampleSteps }, sampleUnit, null);
    expect(done.finished).toMatchObject({ verdict: 'error', errorMessage: 'Fixture FX-101 did not answer', durationMs: 900 });
  });

  it('a reload that was under way while events arrived loses none of them', () => {
    const first = measurementFor(0, 'iinNoLoadMa', 8.2);
    const second = measurementFor(1, 'voutV@1.5', 5.01);
    // the server answered with the state when it was asked: one value
    const fetched = runFromDetail({ ...sampleRun, measurements: [first], steps: sampleSteps }, sampleUnit, null);
    // meanwhile the events brought two
    let cached = withMeasurement(started(), judged(first, 50));
    cached = withMeasurement(cached, judged(second, 60));
    const merged = mergeLiveRuns(fetched, cached);
    expect(Object.keys(merged.measurements).sort()).toEqual(['iin-no-load|iinNoLoadMa', 'vout-load|voutV@1.5']);
    expect(merged.emittedAtMs['vout-load|voutV@1.5']).toBe(60);
    expect(merged.currentStepIndex).toBe(1);
    expect(mergeLiveRuns(fetched, null)).toBe(fetched);
  });
});
