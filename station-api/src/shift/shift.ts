/**
 * Shift windows and the shift counters shown on the station screen and the board. Plain functions on
 * plain data: no Nest, no database. Times of day are local server time (the plant's wall clock).
 */

/** One configured shift start, e.g. 06:00. */
export interface ShiftStart {
  /** Minutes after local midnight, 0..1439 */
  minuteOfDay: number;
  /** As written in the configuration, zero-padded: "06:00" */
  label: string;
}

/** The shift a moment falls in. `start` is inclusive, `end` exclusive: [start, end). */
export interface ShiftWindow {
  /** 1 for the shift that starts earliest in the day, 2 for the next, ... */
  number: number;
  /** "Shift 2 (14:00–22:00)" */
  name: string;
  start: Date;
  end: Date;
}

/** The default of `SHIFT_STARTS`: three eight-hour shifts (common practice, no source). */
export const DEFAULT_SHIFT_STARTS = '06:00,14:00,22:00';

const TIME_RE = /^([01]\d|2[0-3]):([0-5]\d)$/;

/** Thrown for a shift configuration that cannot be used; the message names what to fix. */
export class ShiftConfigError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ShiftConfigError';
  }
}

/**
 * Reads a comma-separated list of local start times ("06:00,14:00,22:00"), sorted by time of day.
 * Spaces around the commas are allowed. One start means one 24-hour shift.
 * @throws ShiftConfigError for an empty list, a time not written HH:MM (00:00–23:59), or a repeated time
 */
export function parseShiftStarts(text: string): ShiftStart[] {
  const parts = text.split(',').map((p) => p.trim());
  if (parts.length === 0 || parts.every((p) => p === '')) {
    throw new ShiftConfigError('SHIFT_STARTS is empty: give at least one start time, e.g. 06:00,14:00,22:00');
  }
  const starts: ShiftStart[] = [];
  for (const part of parts) {
    const m = TIME_RE.exec(part);
    if (!m) {
      throw new ShiftConfigError(`SHIFT_STARTS: "${part}" is not a time of day written HH:MM from 00:00 to 23:59 (e.g. 06:00,14:00,22:00)`);
    }
    const minuteOfDay = Number(m[1]) * 60 + Number(m[2]);
    if (starts.some((s) => s.minuteOfDay === minuteOfDay)) {
      throw new ShiftConfigError(`SHIFT_STARTS: ${part} is listed twice; give each start time once`);
    }
    starts.push({ minuteOfDay, label: part });
  }
  return starts.sort((a, b) => a.minuteOfDay - b.minuteOfDay);
}

/** Local date-time `dayOffset` days from `base`'s local date, at `minuteOfDay`. Date normalises overflowing days. */
function atLocal(base: Date, dayOffset: number, minuteOfDay: number): Date {
  return new Date(base.getFullYear(), base.getMonth(), base.getDate() + dayOffset, Math.floor(minuteOfDay / 60), minuteOfDay % 60, 0, 0);
}

/**
 * The shift that `now` falls in. A shift runs from its start (inclusive) to the next start (exclusive),
 * so a run finishing exactly at 14:00:00.000 belongs to the 14:00 shift. The last shift of the day runs
 * past midnight to the first start of the next day. Local wall-clock times are used, so on a
 * daylight-saving change day a shift is an hour shorter or longer.
 * @param now the moment to place
 * @param starts from {@link parseShiftStarts}: sorted, at least one
 */
export function shiftAt(now: Date, starts: readonly ShiftStart[]): ShiftWindow {
  if (starts.length === 0) throw new ShiftConfigError('At least one shift start is needed');
  const n = starts.length;
  // the latest start at or before now is today's or, before the day's first start, yesterday's last
  for (let dayOffset = 0; dayOffset >= -1; dayOffset--) {
    for (let i = n - 1; i >= 0; i--) {
      const start = atLocal(now, dayOffset, starts[i].minuteOfDay);
      if (start.getTime() <= now.getTime()) {
        const next = i + 1 < n ? { day: dayOffset, i: i + 1 } : { day: dayOffset + 1, i: 0 };
        const end = atLocal(now, next.day, starts[next.i].minuteOfDay);
        return { number: i + 1, name: `Shift ${i + 1} (${starts[i].label}–${starts[next.i].label})`, start, end };
      }
    }
  }
  // unreachable: yesterday's last start is always at or before now
  throw new ShiftConfigError('Could not place the time in a shift');
}

/** A run as the shift counters need it. */
export interface ShiftRun {
  unitId: number;
  /** 1 for the unit's first judged test, 2 for the first retest, ... (errors and aborts do not count up) */
  attempt: number;
  verdict: 'running' | 'pass' | 'fail' | 'error' | 'aborted';
  finishedAt: Date | null;
}

/** The counters of one station in one shift. */
export interface ShiftCounts {
  tested: number;
  passed: number;
  failed: number;
  errors: number;
  aborted: number;
  firstPassYieldPct: number | null;
  unitsPerHour: number | null;
}

/** The rate window: units finished in the last hour are the units per hour once the shift is that old. */
export const RATE_WINDOW_MS = 3_600_000;
/** In a shift younger than the window, a rate over the shift so far is shown only from this many units on. */
export const MIN_UNITS_FOR_EARLY_RATE = 3;

/**
 * First-pass yield in percent: units that passed their first test ÷ units tested for the first time.
 * Follows the common definition "passed the first time, without rework or retest" (D. H. Stamatis, *Six
 * Sigma Fundamentals*, Productivity Press, 2004 — from memory, unverified).
 * @returns null when no unit had its first test (nothing to divide by)
 */
export function firstPassYieldPct(firstPassed: number, firstTested: number): number | null {
  if (!Number.isInteger(firstPassed) || !Number.isInteger(firstTested) || firstPassed < 0 || firstPassed > firstTested) {
    throw new RangeError(`first-pass counts must be whole numbers with 0 ≤ passed ≤ tested, got ${firstPassed} of ${firstTested}`);
  }
  return firstTested === 0 ? null : (100 * firstPassed) / firstTested;
}

/**
 * Units per hour, defined so that it means something from the first unit of a shift on (issue 8: the old
 * "runs ÷ hours since shift start" read 0 after the first unit of a long shift):
 *
 * - once the shift is at least an hour old: the units finished in the last hour (a trailing 60-minute
 *   window ending now, or at the shift end for a shift that is over) — a count, so it is exact and reads 0
 *   only when the station really finished nothing for an hour;
 * - in the shift's first hour, from {@link MIN_UNITS_FOR_EARLY_RATE} units on: units ÷ hours elapsed;
 * - otherwise (fewer units in the first hour, or none in the shift): null, shown as "—".
 *
 * A unit here is a judged run (pass or fail): what the fixture got through, retests included.
 * @param finishedAt finish times of the judged runs in the shift
 * @param until now; a time after the shift end counts as the shift end
 */
export function unitsPerHour(finishedAt: readonly Date[], shiftStart: Date, until: Date, shiftEnd: Date): number | null {
  if (finishedAt.length === 0) return null;
  const end = Math.min(until.getTime(), shiftEnd.getTime());
  const elapsedMs = end - shiftStart.getTime();
  if (elapsedMs >= RATE_WINDOW_MS) {
    // (end − 1 h, end]: a run finishing exactly an hour ago has left the window
    return finishedAt.filter((t) => t.getTime() > end - RATE_WINDOW_MS && t.getTime() <= end).length;
  }
  if (finishedAt.length < MIN_UNITS_FOR_EARLY_RATE || elapsedMs <= 0) return null;
  return finishedAt.length / (elapsedMs / RATE_WINDOW_MS);
}

/**
 * The shift counters of one station, from the runs that finished there. Only runs with `finishedAt` in
 * [window.start, window.end) count; running tests are ignored.
 *
 * - `tested`: distinct units with a judged run (pass or fail) in the shift.
 * - `passed` / `failed`: of those, units whose latest judged run in the shift passed / failed
 *   (so passed + failed = tested; a unit that failed and then passed a retest counts as passed).
 * - `errors` / `aborted`: runs that ended in a fixture or software error / were aborted (runs, not units).
 * - `firstPassYieldPct`: units whose first-ever judged run (attempt 1) passed ÷ units whose first-ever
 *   judged run finished here in this shift; see {@link firstPassYieldPct}. A retest later in the shift
 *   does not change it.
 * - `unitsPerHour`: units finished in the last hour, or early in the shift a rate over the shift so far; see
 *   {@link unitsPerHour}.
 */
export function summarizeShift(runs: readonly ShiftRun[], window: Pick<ShiftWindow, 'start' | 'end'>, now: Date): ShiftCounts {
  const from = window.start.getTime();
  const to = window.end.getTime();
  const inShift = runs.filter((r) => r.finishedAt !== null && r.finishedAt.getTime() >= from && r.finishedAt.getTime() < to);
  const judged = inShift.filter((r) => r.verdict === 'pass' || r.verdict === 'fail');

  const latest = new Map<number, ShiftRun>();
  for (const r of judged) {
    const seen = latest.get(r.unitId);
    if (!seen || r.finishedAt!.getTime() > seen.finishedAt!.getTime() || (r.finishedAt!.getTime() === seen.finishedAt!.getTime() && r.attempt > seen.attempt)) {
      latest.set(r.unitId, r);
    }
  }
  let passed = 0;
  for (const r of latest.values()) if (r.verdict === 'pass') passed++;

  // attempt 1 is judged exactly once per unit: errors and aborts leave the unit's test count unchanged
  const firstRuns = new Map<number, ShiftRun>();
  for (const r of judged) if (r.attempt === 1) firstRuns.set(r.unitId, r);
  let firstPassed = 0;
  for (const r of firstRuns.values()) if (r.verdict === 'pass') firstPassed++;

  return {
    tested: latest.size,
    passed,
    failed: latest.size - passed,
    errors: inShift.filter((r) => r.verdict === 'error').length,
    aborted: inShift.filter((r) => r.verdict === 'aborted').length,
    firstPassYieldPct: firstPassYieldPct(firstPassed, firstRuns.size),
    unitsPerHour: unitsPerHour(judged.map((r) => r.finishedAt!), window.start, now, window.end),
  };
}
