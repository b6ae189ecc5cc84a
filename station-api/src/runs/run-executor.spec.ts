import { describe, expect, it, vi } from 'vitest';
import type { FixtureLink } from '../fixtures/transport/fixture-link.service';
import type { PlanStep } from '../plans/plan-definition';
import type { StationEventMap, StationEventName } from '../realtime/station-events';
import type { StationEventsPublisher } from '../realtime/station-events.publisher';
import { ActiveRuns } from './active-runs';
import { systemClock } from './engine-clock';
import type { MeasurementStore } from './measurement-store';
import { RunExecutor } from './run-executor';
import type { RunRecords } from './run-records';
import { toMeasurementView } from './run-views';

// the step produces a physically impossible efficiency (the registry's plausibility check sets `implausible`)
const IMPLAUSIBLE = 'Efficiency 125.0 % at 1.5 A is above 100 %, which conservation of energy rules out: check the input current shunt';
vi.mock('../plans/step-kinds', () => ({
  runStep: async () => [{ base: 'efficiencyPct', atA: 1.5, value: 125, raw: { pinW: 6, poutW: 7.5 }, implausible: IMPLAUSIBLE }],
  quantityFor: (_key: string, q: unknown[]) => q[0],
}));

function harness(storeStep?: MeasurementStore['storeStep']) {
  const emitted: { name: StationEventName; payload: StationEventMap[StationEventName] }[] = [];
  const events = { emit: (name: StationEventName, payload: never) => emitted.push({ name, payload }) } as unknown as StationEventsPublisher;
  const stored: unknown[] = [];
  const store = {
    storeStep: async (runId: number, rows: Parameters<MeasurementStore['storeStep']>[1]) =>
      rows.map((row) => {
        stored.push(row);
        return toMeasurementView({ ...row, id: stored.length }, runId);
      }),
  } as unknown as MeasurementStore;
  if (storeStep) store.storeStep = storeStep;
  const close = vi.fn(async () => false);
  const records = { close } as unknown as RunRecords;
  const scpi = {
    reset: async () => undefined,
    clearStatus: async () => undefined,
    setUnit: async () => undefined,
    checkErrors: async () => undefined,
    safeState: async () => ({ loadOff: true, sourceOff: true }),
  };
  const link = { scpi, transport: { generation: 1 }, config: { code: 'FX-1' }, settle: async () => undefined } as unknown as FixtureLink;
  return { executor: new RunExecutor(events, store, records, new ActiveRuns()), emitted, stored, close, link };
}

const steps: PlanStep[] = [
  { key: 'eff', name: 'Efficiency', kind: 'efficiency', params: {}, limits: [{ key: 'efficiencyPct@1.5A', name: 'Efficiency', unit: '%', low: 85, rule: 'simple' }] },
  { key: 'never', name: 'Never reached', kind: 'vout_no_load', params: {}, limits: [] },
];

describe('RunExecutor', () => {
  it('ends a run with an implausible reading in error, stores the reading as a fail naming it, and never judges the unit', async () => {
    const h = harness();
    const outcome = await h.executor.execute({
      runId: 7,
      stationId: 1,
      link: h.link,
      clock: systemClock,
      abort: new AbortController(),
      steps,
      stopAtFirstFailure: false,
      unit: { id: 3, serial: 'K5A-2647-00001', lotCode: 'LB-1', view: { id: 3, serial: 'K5A-2647-00001', state: 'untested', testCount: 0, lotCode: 'LB-1', partNumber: 'OB-BK0503', lastTestedAt: null } },
      product: { partNumber: 'OB-BK0503', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 },
      fixture: { voltageUncertaintyV: 0.005 },
      startedAt: new Date(),
    });
    expect(outcome).toMatchObject({ runId: 7, verdict: 'error', endReason: 'implausible_reading' });
    expect(outcome.errorMessage).toContain(IMPLAUSIBLE);
    // the reading is kept (a measured result is never lost), as a fail with the reason
    expect(h.stored).toHaveLength(1);
    expect(h.stored[0]).toMatchObject({ value: 125, verdict: 'fail', decision: null, raw: { problem: IMPLAUSIBLE } });
    // stored as an error, so the unit is not counted as passed or failed
    expect(h.close).toHaveBeenCalledWith(7, 3, expect.objectContaining({ verdict: 'error', endReason: 'implausible_reading' }), expect.any(Date));
    const finished = h.emitted.find((e) => e.name === 'run:finished')!.payload as StationEventMap['run:finished'];
    expect(finished).toMatchObject({ verdict: 'error', endReason: 'implausible_reading', failures: [] });
    // the run stopped at the impossible step
    expect(h.emitted.filter((e) => e.name === 'step:started')).toHaveLength(1);
  });

  it('ends the run store_failed when a step cannot be committed, and shows nothing of that step', async () => {
    const h = harness(async () => {
      throw new Error('SQLITE_FULL: database or disk is full');
    });
    const outcome = await h.executor.execute({
      runId: 8,
      stationId: 1,
      link: h.link,
      clock: systemClock,
      abort: new AbortController(),
      steps,
      stopAtFirstFailure: false,
      unit: { id: 3, serial: 'K5A-2647-00002', lotCode: 'LB-1', view: { id: 3, serial: 'K5A-2647-00002', state: 'untested', testCount: 0, lotCode: 'LB-1', partNumber: 'OB-BK0503', lastTestedAt: null } },
      product: { partNumber: 'OB-BK0503', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 },
      fixture: { voltageUncertaintyV: 0.005 },
      startedAt: new Date(),
    });
    expect(outcome).toMatchObject({ runId: 8, verdict: 'error', endReason: 'store_failed' });
    expect(outcome.errorMessage).toContain('SQLITE_FULL');
    expect(h.emitted.filter((e) => e.name === 'measurement:judged')).toEqual([]);
    // the run stopped at the step it could not store
    expect(h.emitted.filter((e) => e.name === 'step:started')).toHaveLength(1);
    expect(h.close).toHaveBeenCalledWith(8, 3, expect.objectContaining({ verdict: 'error', endReason: 'store_failed' }), expect.any(Date));
  });
});
