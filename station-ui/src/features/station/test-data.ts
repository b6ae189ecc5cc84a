import type { MeasurementView, RunView, StepOutline, UnitView } from '@station-events';

/** Sample data shaped like the server's payloads, for the station feature's tests (invented demo plant). */
export const sampleSteps: StepOutline[] = [
  {
    key: 'iin-no-load',
    name: 'Input current at no load',
    kind: 'input_current_no_load',
    limits: [{ key: 'iinNoLoadMa', name: 'Input current, no load', unit: 'mA', high: 15, uncertainty: 0.2, rule: 'simple' }],
  },
  {
    key: 'vout-load',
    name: 'Output voltage at half and full load',
    kind: 'vout_at_load',
    limits: [
      { key: 'voutV@1.5', name: 'Output voltage at 1.5 A', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' },
      { key: 'voutV@3', name: 'Output voltage at 3 A', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' },
    ],
  },
  {
    key: 'protection',
    name: 'Overload at 6 A folds back and recovers',
    kind: 'protection',
    limits: [
      { key: 'foldback', name: 'Output folds back on overload', unit: 'flag', low: 1, high: 1, rule: 'simple' },
      { key: 'recovered', name: 'Output recovers after overload', unit: 'flag', low: 1, high: 1, rule: 'simple' },
    ],
  },
];

export const sampleRun: RunView = {
  id: 41,
  stationId: 1,
  stationCode: 'EOL-1',
  unitId: 7,
  serial: 'K5A-2648-00017',
  lotId: 6,
  lotCode: 'LB-2648-01',
  productId: 1,
  partNumber: 'OB-BK0503',
  planVersionId: 1,
  planCode: 'EOL-BK0503',
  planVersion: 1,
  operatorId: 3,
  operatorName: 'Demo operator',
  fixtureId: 1,
  fixtureCode: 'FX-101',
  attempt: 1,
  verdict: 'running',
  startedAt: '2026-11-26T08:00:00.000Z',
  finishedAt: null,
  durationMs: null,
  failedStepKey: null,
  errorMessage: null,
  endReason: null,
  fixtureIdentity: 'RAILWRIGHT,SIM-FIXTURE,FX-101,1.0',
  fixtureCalibrationDueAt: null,
  fixtureContactCycles: 10,
  overrideReason: null,
  overrideByName: null,
};

export const sampleUnit: UnitView = {
  id: 7,
  serial: 'K5A-2648-00017',
  state: 'untested',
  testCount: 0,
  lotCode: 'LB-2648-01',
  partNumber: 'OB-BK0503',
  lastTestedAt: null,
};

let nextId = 1000;

/** A judged measurement for one limit of {@link sampleSteps}. */
export function measurementFor(
  stepIndex: number,
  limitKey: string,
  value: number | null,
  verdict: MeasurementView['verdict'] = 'pass',
  extra: Partial<MeasurementView> = {},
): MeasurementView {
  const step = sampleSteps[stepIndex]!;
  const limit = step.limits.find((l) => l.key === limitKey)!;
  const guarded = limit.rule === 'guarded' && limit.low !== undefined && limit.high !== undefined;
  return {
    id: nextId++,
    runId: sampleRun.id,
    stepIndex,
    stepKey: step.key,
    stepName: step.name,
    quantity: limit.key,
    name: limit.name,
    value,
    unit: limit.unit,
    lowLimit: limit.low ?? null,
    highLimit: limit.high ?? null,
    guardedLow: guarded ? limit.low! + limit.uncertainty! : null,
    guardedHigh: guarded ? limit.high! - limit.uncertainty! : null,
    uncertainty: limit.uncertainty ?? 0,
    rule: limit.rule,
    verdict,
    decision: null,
    raw: null,
    startedAt: '2026-11-26T08:00:01.000Z',
    measuredAt: '2026-11-26T08:00:02.000Z',
    ...extra,
  };
}
