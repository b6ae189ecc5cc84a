import type { BoardStation } from './api/get-board';

/** Board tiles shaped like `GET /api/board`, for the board's tests (invented demo plant). */
export function sampleBoard(): BoardStation[] {
  const shift = (stationId: number, tested: number, passed: number, fpy: number | null) => ({
    stationId,
    shiftName: 'Early',
    shiftStart: '2026-11-26T06:00:00.000Z',
    shiftEnd: '2026-11-26T14:00:00.000Z',
    tested,
    passed,
    failed: tested - passed,
    errors: 0,
    aborted: 0,
    firstPassYieldPct: fpy,
    unitsPerHour: null,
  });
  return [
    {
      station: { id: 1, code: 'EOL-1', name: 'End-of-line 1' },
      state: 'ready',
      reasons: [],
      fixture: { code: 'FX-101', calibrationDueAt: '2027-01-01T00:00:00.000Z' },
      activeLot: { id: 6, code: 'LB-2648-01', partNumber: 'OB-BK0503' },
      currentRun: null,
      lastRuns: [
        { id: 12, serial: 'K5A-2648-00012', verdict: 'fail', failedStepKey: 'vout-load', finishedAt: '2026-11-26T08:10:00.000Z' },
        { id: 11, serial: 'K5A-2648-00011', verdict: 'pass', failedStepKey: null, finishedAt: '2026-11-26T08:09:00.000Z' },
      ],
      shift: shift(1, 2, 1, 50),
    },
    {
      station: { id: 2, code: 'EOL-2', name: 'End-of-line 2' },
      state: 'blocked',
      reasons: ['Calibration of FX-102 overdue since 3 Nov'],
      fixture: { code: 'FX-102', calibrationDueAt: '2026-11-03T00:00:00.000Z' },
      activeLot: { id: 7, code: 'LB-2648-02', partNumber: 'OB-BK3305' },
      currentRun: null,
      lastRuns: [],
      shift: shift(2, 0, 0, null),
    },
  ];
}
