/**
 * A station's counts for the current shift, as `GET /api/stations/:id/shift-summary` and each tile of
 * `GET /api/board` carry them; the board and the station screen both show it.
 */
export interface ShiftSummary {
  stationId: number;
  shiftName: string;
  /** ISO 8601 */
  shiftStart: string;
  shiftEnd: string;
  tested: number;
  passed: number;
  failed: number;
  errors: number;
  aborted: number;
  /** First-pass yield in %, null before the first unit of the shift */
  firstPassYieldPct: number | null;
  unitsPerHour: number | null;
}
