import { describe, expect, it } from 'vitest';
import {
  DEFAULT_SHIFT_STARTS,
  firstPassYieldPct,
  parseShiftStarts,
  ShiftConfigError,
  ShiftRun,
  shiftAt,
  summarizeShift,
  unitsPerHour,
} from './shift';

// Dates are built with the local-time constructor, so these tests hold in any server time zone
// (except on the day of a daylight-saving change, which none of them uses).
const at = (y: number, mo: number, d: number, h: number, mi = 0, s = 0, ms = 0) => new Date(y, mo - 1, d, h, mi, s, ms);
const STARTS = parseShiftStarts(DEFAULT_SHIFT_STARTS);
const rel = (actual: number | null, expected: number) => {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected) / Math.abs(expected)).toBeLessThan(1e-12);
};

describe('parseShiftStarts', () => {
  it('reads HH:MM times, sorted by time of day, spaces allowed', () => {
    expect(parseShiftStarts('22:00, 06:00 ,14:00')).toEqual([
      { minuteOfDay: 360, label: '06:00' },
      { minuteOfDay: 840, label: '14:00' },
      { minuteOfDay: 1320, label: '22:00' },
    ]);
    expect(parseShiftStarts('00:00')).toEqual([{ minuteOfDay: 0, label: '00:00' }]);
    expect(parseShiftStarts('23:59')[0].minuteOfDay).toBe(1439);
  });

  it.each([
    ['', /empty/],
    [' , ', /empty/],
    ['06:00,', /"" is not a time of day/],
    ['6:00', /"6:00" is not a time of day/],
    ['24:00', /"24:00" is not a time of day/],
    ['06:60', /"06:60"/],
    ['06:00,14:00,06:00', /06:00 is listed twice/],
    ['06:00;14:00', /"06:00;14:00"/],
  ])('refuses %j with a message naming the fault', (text, message) => {
    expect(() => parseShiftStarts(text)).toThrow(ShiftConfigError);
    expect(() => parseShiftStarts(text)).toThrow(message);
  });
});

describe('shiftAt', () => {
  it('places a time inside the day shift', () => {
    const w = shiftAt(at(2026, 12, 2, 10, 15), STARTS);
    expect(w).toEqual({ number: 1, name: 'Shift 1 (06:00–14:00)', start: at(2026, 12, 2, 6), end: at(2026, 12, 2, 14) });
  });

  it('treats the start as inclusive and the end as exclusive', () => {
    expect(shiftAt(at(2026, 12, 2, 14, 0, 0, 0), STARTS).number).toBe(2);
    expect(shiftAt(at(2026, 12, 2, 13, 59, 59, 999), STARTS).number).toBe(1);
    expect(shiftAt(at(2026, 12, 2, 6, 0, 0, 0), STARTS).start).toEqual(at(2026, 12, 2, 6));
    expect(shiftAt(at(2026, 12, 2, 5, 59, 59, 999), STARTS).number).toBe(3);
  });

  it('runs the night shift across midnight, from either side', () => {
    const evening = shiftAt(at(2026, 12, 2, 23, 30), STARTS);
    expect(evening).toEqual({ number: 3, name: 'Shift 3 (22:00–06:00)', start: at(2026, 12, 2, 22), end: at(2026, 12, 3, 6) });
    const small = shiftAt(at(2026, 12, 3, 3, 0), STARTS);
    expect(small).toEqual(evening);
    expect(shiftAt(at(2026, 12, 3, 0, 0), STARTS)).toEqual(evening);
  });

  it('crosses month and year ends', () => {
    const w = shiftAt(at(2026, 12, 31, 23, 0), STARTS);
    expect(w.start).toEqual(at(2026, 12, 31, 22));
    expect(w.end).toEqual(at(2027, 1, 1, 6));
    const early = shiftAt(at(2027, 1, 1, 2, 0), STARTS);
    expect(early.start).toEqual(at(2026, 12, 31, 22));
  });

  it('with one start, makes one 24-hour shift', () => {
    const one = parseShiftStarts('07:30');
    const w = shiftAt(at(2026, 12, 2, 7, 0), one);
    expect(w).toEqual({ number: 1, name: 'Shift 1 (07:30–07:30)', start: at(2026, 12, 1, 7, 30), end: at(2026, 12, 2, 7, 30) });
  });

  it('handles two unequal shifts', () => {
    const two = parseShiftStarts('18:00,07:00');
    expect(shiftAt(at(2026, 12, 2, 12), two).name).toBe('Shift 1 (07:00–18:00)');
    expect(shiftAt(at(2026, 12, 2, 6, 59), two)).toMatchObject({ name: 'Shift 2 (18:00–07:00)', start: at(2026, 12, 1, 18), end: at(2026, 12, 2, 7) });
  });

  it('refuses an empty list', () => {
    expect(() => shiftAt(new Date(), [])).toThrow(ShiftConfigError);
  });
});

describe('firstPassYieldPct', () => {
  it('matches the worked first-pass yield: 962 of 1000 pass first time → 96.2 %', () => {
    // self-constructed example; definition of first-pass yield: D. H. Stamatis, Six Sigma Fundamentals (from memory, unverified)
    rel(firstPassYieldPct(962, 1000), 96.2);
  });

  it('is null with nothing tested and refuses impossible counts', () => {
    expect(firstPassYieldPct(0, 0)).toBeNull();
    expect(firstPassYieldPct(0, 4)).toBe(0);
    expect(firstPassYieldPct(4, 4)).toBe(100);
    expect(() => firstPassYieldPct(5, 4)).toThrow(RangeError);
    expect(() => firstPassYieldPct(-1, 4)).toThrow(RangeError);
    expect(() => firstPassYieldPct(1.5, 4)).toThrow(RangeError);
  });
});

// Definition written for issue 8 ("Units per hour shows 0 after the first unit of a shift"); the figures
// are self-constructed examples worked by hand.
describe('unitsPerHour', () => {
  const start = at(2026, 12, 2, 6);
  const end = at(2026, 12, 2, 14);
  const times = (...hm: [number, number][]) => hm.map(([h, m]) => at(2026, 12, 2, h, m));

  it('counts the units finished in the last hour once the shift is an hour old', () => {
    // 10:00: the window is (09:00, 10:00]; 08:30 and 09:00 are outside, 09:01 … 10:00 inside
    expect(unitsPerHour(times([8, 30], [9, 0], [9, 1], [9, 30], [10, 0]), start, at(2026, 12, 2, 10), end)).toBe(3);
  });

  it('shows 1, not 0, after the first unit of a shift that began hours ago (the reported defect)', () => {
    // old definition: 1 run ÷ 5 h = 0.2 → shown as 0
    expect(unitsPerHour(times([11, 0]), start, at(2026, 12, 2, 11, 0, 30), end)).toBe(1);
  });

  it('reads 0 only when the station finished nothing in the last hour', () => {
    expect(unitsPerHour(times([7, 0], [7, 10]), start, at(2026, 12, 2, 9), end)).toBe(0);
  });

  it('in the first hour: a rate over the shift so far from 3 units on, else null', () => {
    // 3 units by 06:45 → 3 ÷ 0.75 h = 4 per hour
    expect(unitsPerHour(times([6, 20], [6, 30], [6, 44]), start, at(2026, 12, 2, 6, 45), end)).toBe(4);
    expect(unitsPerHour(times([6, 20], [6, 30]), start, at(2026, 12, 2, 6, 45), end)).toBeNull();
    // an hour of shift with 3 units is the window rule: 3
    expect(unitsPerHour(times([6, 20], [6, 30], [6, 44]), start, at(2026, 12, 2, 7), end)).toBe(3);
  });

  it('stops the clock at the shift end and is null when the shift has no unit', () => {
    // shift over (14:00): the window is (13:00, 14:00]
    expect(unitsPerHour(times([12, 59], [13, 30], [13, 59]), start, at(2026, 12, 2, 20), end)).toBe(2);
    expect(unitsPerHour([], start, at(2026, 12, 2, 8), end)).toBeNull();
  });
});

describe('summarizeShift', () => {
  const window = { start: at(2026, 12, 2, 6), end: at(2026, 12, 2, 14) };
  const now = at(2026, 12, 2, 10);
  let minute = 0;
  const run = (unitId: number, attempt: number, verdict: ShiftRun['verdict'], finishedAt: Date | null = at(2026, 12, 2, 7, minute++ % 60)): ShiftRun => ({
    unitId,
    attempt,
    verdict,
    finishedAt,
  });

  it('reproduces the worked yield example: 1000 units, 962 first-time passes, 30 pass on retest, 8 fail again', () => {
    // self-constructed example (arithmetic): FPY = 962/1000 = 0.962, final yield = 992/1000 = 0.992
    const runs: ShiftRun[] = [];
    for (let u = 1; u <= 1000; u++) {
      const t = at(2026, 12, 2, 7, 0, 0, u);
      if (u <= 962) runs.push({ unitId: u, attempt: 1, verdict: 'pass', finishedAt: t });
      else {
        runs.push({ unitId: u, attempt: 1, verdict: 'fail', finishedAt: t });
        runs.push({ unitId: u, attempt: 2, verdict: u <= 992 ? 'pass' : 'fail', finishedAt: at(2026, 12, 2, 9, 0, 0, u) });
      }
    }
    const c = summarizeShift(runs, window, now);
    expect(c.tested).toBe(1000);
    rel(c.firstPassYieldPct, 96.2);
    expect(c.passed).toBe(992);
    rel(c.passed / c.tested, 0.992);
    expect(c.failed).toBe(8);
    // the shift is 4 h old at 10:00: units per hour = judged runs finished in (09:00, 10:00] — the 38
    // retests, finished a few milliseconds after 09:00
    expect(c.unitsPerHour).toBe(38);
  });

  it('counts a finish exactly at the shift start, not one exactly at the shift end', () => {
    const c = summarizeShift(
      [run(1, 1, 'pass', window.start), run(2, 1, 'pass', window.end), run(3, 1, 'fail', at(2026, 12, 2, 5, 59, 59, 999))],
      window,
      now,
    );
    expect(c).toMatchObject({ tested: 1, passed: 1, failed: 0, firstPassYieldPct: 100 });
  });

  it('counts errors and aborts as runs, ignores running tests, and keeps them out of tested and FPY', () => {
    const c = summarizeShift(
      [run(1, 1, 'error'), run(1, 1, 'aborted'), run(1, 1, 'fail'), run(2, 1, 'running', null), run(3, 1, 'aborted'), run(4, 1, 'pass')],
      window,
      now,
    );
    expect(c).toMatchObject({ tested: 2, passed: 1, failed: 1, errors: 1, aborted: 2, firstPassYieldPct: 50 });
  });

  it('leaves out of FPY a unit whose first test was before this shift, and keeps a first-time failure out of the numerator after a passing retest', () => {
    const c = summarizeShift([run(1, 2, 'pass'), run(2, 1, 'fail'), run(2, 2, 'pass')], window, now);
    // unit 1: retest only (first test earlier) → tested and passed, not in FPY; unit 2: failed first → 0/1
    expect(c).toMatchObject({ tested: 2, passed: 2, failed: 0, firstPassYieldPct: 0 });
  });

  it('judges a unit by its latest run in the shift', () => {
    const c = summarizeShift(
      [run(1, 1, 'pass', at(2026, 12, 2, 7)), run(1, 2, 'fail', at(2026, 12, 2, 8))],
      window,
      now,
    );
    expect(c).toMatchObject({ tested: 1, passed: 0, failed: 1, firstPassYieldPct: 100 });
  });

  it('gives nulls, not zeros or NaN, for an empty shift', () => {
    expect(summarizeShift([], window, now)).toEqual({
      tested: 0,
      passed: 0,
      failed: 0,
      errors: 0,
      aborted: 0,
      firstPassYieldPct: null,
      unitsPerHour: null,
    });
  });
});
