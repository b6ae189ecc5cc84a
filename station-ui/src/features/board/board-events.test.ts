import { describe, expect, it } from 'vitest';
import { boardWithRunFinished, boardWithRunStarted, boardWithState, boardWithStepStarted } from './board-events';
import { sampleBoard } from './test-data';

const run = { id: 13, serial: 'K5A-2648-00013', startedAt: '2026-11-26T08:11:00.000Z' };
const steps = [
  { key: 'iin-no-load', name: 'Input current at no load', kind: 'input_current_no_load', limits: [] },
  { key: 'vout-no-load', name: 'Output voltage at no load', kind: 'vout_no_load', limits: [] },
];
const started = {
  stationId: 1,
  emittedAt: 1,
  run: { ...run, stationId: 1 } as never,
  unit: { serial: run.serial } as never,
  steps,
};

describe('board events', () => {
  it('a started run shows its unit and first step on the tile', () => {
    const b = boardWithRunStarted(sampleBoard(), started);
    expect(b[0]!.state).toBe('testing');
    expect(b[0]!.currentRun).toMatchObject({ id: 13, serial: 'K5A-2648-00013', stepIndex: 0, stepCount: 2, stepName: 'Input current at no load' });
    expect(b[1]).toEqual(sampleBoard()[1]);
  });

  it('a started step is named from the run outline', () => {
    let b = boardWithRunStarted(sampleBoard(), started);
    const info = { serial: run.serial, startedAt: run.startedAt, stepNames: ['Input current at no load', 'Output voltage at no load'] };
    b = boardWithStepStarted(b, { stationId: 1, emittedAt: 2, runId: 13, stepKey: 'vout-no-load', stepIndex: 1 }, info);
    expect(b[0]!.currentRun).toMatchObject({ stepIndex: 1, stepName: 'Output voltage at no load' });
    // a step of another run changes nothing
    expect(boardWithStepStarted(b, { stationId: 1, emittedAt: 3, runId: 99, stepKey: 'x', stepIndex: 5 })).toEqual(b);
  });

  it('a finished run goes to the front of the last verdicts, once', () => {
    let b = boardWithRunStarted(sampleBoard(), started);
    const finished = {
      stationId: 1,
      emittedAt: 4,
      runId: 13,
      verdict: 'pass' as const,
      failures: [],
      durationMs: 8000,
      unit: { serial: run.serial } as never,
    };
    b = boardWithRunFinished(b, finished, '2026-11-26T08:12:00.000Z');
    expect(b[0]!.currentRun).toBeNull();
    expect(b[0]!.lastRuns.map((r) => [r.id, r.verdict])).toEqual([
      [13, 'pass'],
      [12, 'fail'],
      [11, 'pass'],
    ]);
    expect(boardWithRunFinished(b, finished)[0]!.lastRuns).toHaveLength(3);
  });

  it('a state change carries the reasons; leaving "testing" clears the unit under test', () => {
    let b = boardWithRunStarted(sampleBoard(), started);
    b = boardWithState(b, { stationId: 1, emittedAt: 5, state: 'fault', reasons: ['Fixture FX-101 does not answer'], warnings: ['Calibration due 22 Dec 2026 (in 20 days); book the recalibration'] });
    expect(b[0]).toMatchObject({
      state: 'fault',
      reasons: ['Fixture FX-101 does not answer'],
      warnings: ['Calibration due 22 Dec 2026 (in 20 days); book the recalibration'],
      currentRun: null,
    });
  });

  it('a step of a run the refetched board missed brings the unit under test back', () => {
    const info = { serial: run.serial, startedAt: run.startedAt, stepNames: ['Input current at no load', 'Output voltage at no load'] };
    const b = boardWithStepStarted(sampleBoard(), { stationId: 1, emittedAt: 2, runId: 13, stepKey: 'vout-no-load', stepIndex: 1 }, info);
    expect(b[0]).toMatchObject({ state: 'testing', currentRun: { id: 13, serial: run.serial, stepIndex: 1, stepCount: 2, stepName: 'Output voltage at no load' } });
  });
});
