import { describe, expect, it } from 'vitest';
import { formatSerial, isoWeek, parseSerialPattern, sequenceOf, serialPatternProblem, serialRange, yearWeekCode } from './serial-numbers';

describe('isoWeek', () => {
  // Expected values from GNU coreutils `date -d <day> +%G-W%V` (ISO 8601 week-numbering year and week),
  // run on this machine. The first three are also commonly quoted ISO 8601 week-date examples (recalled
  // from memory).
  const cases: [string, number, number][] = [
    ['2008-12-29', 2009, 1],
    ['2010-01-03', 2009, 53],
    ['2005-01-01', 2004, 53],
    ['2020-12-31', 2020, 53],
    ['2021-01-03', 2020, 53],
    ['2021-01-04', 2021, 1],
    ['2016-01-01', 2015, 53],
    ['2026-11-26', 2026, 48],
    ['2026-12-02', 2026, 49],
    ['2027-01-01', 2026, 53],
  ];
  it.each(cases)('%s is ISO year %i week %i', (day, isoYear, week) => {
    const [y, m, d] = day.split('-').map(Number);
    expect(isoWeek(new Date(y, m - 1, d, 12))).toEqual({ isoYear, week });
  });

  it('uses the local calendar day, not the UTC one, just after local midnight', () => {
    // Monday 2021-01-04 00:05 local is week 1 whatever the offset to UTC
    expect(isoWeek(new Date(2021, 0, 4, 0, 5))).toEqual({ isoYear: 2021, week: 1 });
  });
});

describe('yearWeekCode', () => {
  it('gives YYWW from the ISO week-numbering year, which differs from the calendar year at New Year', () => {
    // GNU date: 2027-01-01 → 2026-W53; architecture.md example serial week "2648" = ISO 2026 week 48
    expect(yearWeekCode(new Date(2027, 0, 1, 12))).toBe('2653');
    expect(yearWeekCode(new Date(2026, 10, 26, 12))).toBe('2648');
    expect(yearWeekCode(new Date(2009, 0, 5, 12))).toBe('0902');
  });
});

describe('serial patterns', () => {
  it('reads the demo patterns of docs/architecture.md', () => {
    expect(parseSerialPattern(String.raw`^K5A-\d{4}-\d{5}$`)).toEqual({ prefix: 'K5A-', separator: '-', suffix: '' });
    expect(parseSerialPattern(String.raw`^KC2-\d{4}-\d{5}$`)).toEqual({ prefix: 'KC2-', separator: '-', suffix: '' });
  });

  it('accepts escaped separators and refuses patterns it cannot fill in', () => {
    expect(parseSerialPattern(String.raw`^AB\.\d{4}\/\d{5}$`)).toEqual({ prefix: 'AB.', separator: '/', suffix: '' });
    expect(parseSerialPattern(String.raw`^K5A-\d{4}-\d{5}`)).toBeNull(); // not anchored at the end
    expect(parseSerialPattern(String.raw`^K5A-[0-9]{4}-\d{5}$`)).toBeNull();
    expect(parseSerialPattern(String.raw`^K5A-\d{4}-\d+$`)).toBeNull();
  });

  it('explains what is wrong with a pattern', () => {
    expect(serialPatternProblem('^K5A-(')).toMatch(/not a valid regular expression/);
    expect(serialPatternProblem('^.*$')).toMatch(/must have the form/);
    expect(serialPatternProblem(String.raw`^K5A-\d{4}-\d{5}$`)).toBeNull();
  });
});

describe('serial generation', () => {
  const t = parseSerialPattern(String.raw`^K5A-\d{4}-\d{5}$`)!;

  it('produces serials that match the product pattern', () => {
    const serials = serialRange(t, '2649', 1, 3);
    expect(serials).toEqual(['K5A-2649-00001', 'K5A-2649-00002', 'K5A-2649-00003']);
    for (const s of serials) expect(s).toMatch(new RegExp(String.raw`^K5A-\d{4}-\d{5}$`));
  });

  it('keeps the sequence inside five digits', () => {
    expect(formatSerial(t, '2649', 99_999)).toBe('K5A-2649-99999');
    expect(() => formatSerial(t, '2649', 0)).toThrow(RangeError);
    expect(() => serialRange(t, '2649', 99_990, 11)).toThrow(/run past 99999/);
  });

  it('reads the sequence back out of a serial', () => {
    expect(sequenceOf(t, 'K5A-2649-00217')).toBe(217);
    expect(sequenceOf(t, 'K3E-2649-00217')).toBeNull();
  });
});
