import type { RunDetail } from './api/get-run';
import type { RunCalibration, RunMeasurement as MeasurementView, RunRow as RunView } from './api/run-types';

/** Invented Orrin Bay runs for the component tests (docs/architecture.md demo plant). */
export function makeRun(overrides: Partial<RunView> = {}): RunView {
  return {
    id: 41,
    stationId: 1,
    stationCode: 'EOL-1',
    unitId: 7,
    serial: 'K5A-2648-00002',
    lotId: 3,
    lotCode: 'LB-2648-01',
    productId: 1,
    partNumber: 'OB-BK0503',
    endReason: null,
    planVersionId: 5,
    planCode: 'TP-BK0503',
    planVersion: 2,
    operatorId: 4,
    operatorName: 'Ada Operator',
    fixtureId: 2,
    fixtureCode: 'FX-01',
    attempt: 1,
    verdict: 'fail',
    startedAt: '2026-03-02T09:15:04.000Z',
    finishedAt: '2026-03-02T09:15:12.400Z',
    durationMs: 8_400,
    failedStepKey: 'vout_nominal',
    errorMessage: null,
    fixtureIdentity: 'Orrin Bay,EOL-FIXTURE,FX-01,1.4.0',
    fixtureCalibrationDueAt: '2026-09-30T00:00:00.000Z',
    fixtureContactCycles: 12_345,
    overrideReason: null,
    overrideByName: null,
    ...overrides,
  };
}

export function makeMeasurement(overrides: Partial<MeasurementView> = {}): MeasurementView {
  return {
    id: 100,
    runId: 41,
    stepIndex: 2,
    stepKey: 'vout_nominal',
    stepName: 'Output at nominal load',
    quantity: 'vout',
    name: 'Output voltage',
    value: 3.3,
    unit: 'V',
    lowLimit: 3.25,
    highLimit: 3.35,
    guardedLow: 3.25,
    guardedHigh: 3.35,
    uncertainty: 0.004,
    rule: 'simple',
    verdict: 'pass',
    decision: 'pass',
    raw: { samples: [3.301, 3.299], dmmRange: '10V' },
    startedAt: '2026-03-02T09:15:06.000Z',
    measuredAt: '2026-03-02T09:15:06.500Z',
    ...overrides,
  };
}

/** The calibration record a test run was judged with (invented Orrin Bay certificate). */
export function makeCalibration(overrides: Partial<RunCalibration> = {}): RunCalibration {
  return {
    id: 7,
    fixtureId: 2,
    calibratedAt: '2026-01-12T09:00:00.000Z',
    dueAt: '2026-09-30T00:00:00.000Z',
    recordedAt: '2026-01-12T14:20:00.000Z',
    recordedBy: 'Eli Engineer',
    certificateNumber: 'OBE-CAL-26-0042',
    voltageUncertaintyV: 0.004,
    currentUncertaintyA: 0.003,
    uncertainties: [
      { quantity: 'voutV', name: 'Output voltage', unit: 'V', uncertainty: 0.004 },
      { quantity: 'rippleMvPp', name: 'Output ripple and noise, peak-to-peak', unit: 'mV', uncertainty: 1.5 },
    ],
    certificateFile: { fileName: 'OBE-CAL-26-0042.pdf', sizeBytes: 48_640, href: '/api/fixtures/2/calibrations/7/certificate' },
    current: true,
    ...overrides,
  };
}

export function makeRunDetail(overrides: Partial<RunDetail> = {}): RunDetail {
  return {
    ...makeRun(),
    measurements: [
      makeMeasurement(),
      makeMeasurement({
        id: 101,
        quantity: 'vout@full',
        name: 'Output voltage at full load',
        value: 3.348,
        guardedLow: 3.254,
        guardedHigh: 3.346,
        rule: 'guarded',
        verdict: 'guard_fail',
        decision: 'conditional_fail',
        raw: { samples: [3.348] },
      }),
    ],
    steps: [],
    calibration: makeCalibration(),
    ...overrides,
  };
}
