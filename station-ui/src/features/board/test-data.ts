import type { BoardStation } from './api/get-board';

/** Board tiles shaped like `GET /api/board`, for the board's tests (invented demo plant). */
// one "now" per test file, so two sample boards are equal
const LOADED_AT = Math.floor(Date.now() / 60_000) * 60_000;

/** A time `minutes` from now, ISO 8601: the sample shift is always the one under way. */
export const minutesFromNow = (minutes: number): string => new Date(LOADED_AT + minutes * 60_000).toISOString();

export function sampleBoard(): BoardStation[] {
  const shift = (stationId: number, tested: number, passed: number, fpy: number | null) => ({
    stationId,
    shiftName: 'Early',
    shiftStart: minutesFromNow(-240),
    shiftEnd: minutesFromNow(240),
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
      warnings: [],
      fixture: { code: 'FX-101', calibrationDueAt: '2027-01-01T00:00:00.000Z' },
      activeLot: { id: 6, code: 'LB-2648-01', partNumber: 'OB-BK0503' },
      currentRun: null,
      lastRuns: [
        { id: 12, serial: 'K5A-2648-00012', verdict: 'fail', failedStepKey: 'vout-load', finishedAt: minutesFromNow(-20) },
        { id: 11, serial: 'K5A-2648-00011', verdict: 'pass', failedStepKey: null, finishedAt: minutesFromNow(-21) },
      ],
      shift: shift(1, 2, 1, 50),
    },
    {
      station: { id: 2, code: 'EOL-2', name: 'End-of-line 2' },
      state: 'blocked',
      reasons: ['Calibration of FX-102 overdue since 3 Nov'],
      warnings: [],
      fixture: { code: 'FX-102', calibrationDueAt: '2026-11-03T00:00:00.000Z' },
      activeLot: { id: 7, code: 'LB-2648-02', partNumber: 'OB-BK3305' },
      currentRun: null,
      lastRuns: [],
      shift: shift(2, 0, 0, null),
    },
  ];
}
