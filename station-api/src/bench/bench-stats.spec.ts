import { mean, quantileSorted } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { quantile, summarize } from './bench-stats';

describe('benchmark statistics', () => {
  const xs = [15, 20, 35, 40, 50];
  it('takes the nearest-rank quantile', () => {
    // simple-statistics quantileSorted (nearest-rank for these p) as reference
    expect(quantile(xs, 0.5)).toBe(quantileSorted(xs, 0.5));
    expect(quantile(xs, 0.4)).toBe(20);
    expect(quantile(xs, 1)).toBe(50);
  });
  it('summarizes with the mean', () => {
    // simple-statistics mean as reference
    expect(summarize([50, 15, 40, 20, 35]).mean).toBeCloseTo(mean(xs), 12);
  });
});
