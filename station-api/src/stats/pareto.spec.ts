import { sum } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { paretoTable } from './pareto';

describe('paretoTable', () => {
  it('sorts descending and accumulates percentages (self-constructed example)', () => {
    const rows = paretoTable([
      { key: 'ripple', count: 12 },
      { key: 'efficiency', count: 30 },
      { key: 'load regulation', count: 5 },
      { key: 'ripple', count: 3 },
      { key: 'start-up', count: 0 },
    ]);
    expect(rows.map((r) => r.key)).toEqual(['efficiency', 'ripple', 'load regulation', 'start-up']);
    expect(rows.map((r) => r.count)).toEqual([30, 15, 5, 0]);
    // simple-statistics sum as reference for the running totals
    const counts = [30, 15, 5, 0];
    expect(rows.map((r) => r.cumulativeCount)).toEqual(counts.map((_, i) => sum(counts.slice(0, i + 1))));
    expect(rows[0].percent).toBeCloseTo(60, 12);
    expect(rows[1].cumulativePercent).toBeCloseTo(90, 12);
    expect(rows[3].cumulativePercent).toBe(100);
  });

  it('keeps ties in alphabetical order and ends at exactly 100 %', () => {
    const rows = paretoTable([
      { key: 'b', count: 1 },
      { key: 'a', count: 1 },
      { key: 'c', count: 1 },
    ]);
    expect(rows.map((r) => r.key)).toEqual(['a', 'b', 'c']);
    expect(rows[2].cumulativePercent).toBe(100);
  });

  it('returns [] for no input and zeros when nothing was counted', () => {
    expect(paretoTable([])).toEqual([]);
    expect(paretoTable([{ key: 'x', count: 0 }])[0]).toMatchObject({ percent: 0, cumulativePercent: 0 });
  });

  it('refuses bad counts and missing labels', () => {
    expect(() => paretoTable([{ key: 'x', count: -1 }])).toThrow(/whole numbers/);
    expect(() => paretoTable([{ key: 'x', count: 1.5 }])).toThrow(/whole numbers/);
    expect(() => paretoTable([{ key: '', count: 1 }])).toThrow(/no category label/);
  });
});
