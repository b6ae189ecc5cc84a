import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { jStat } from 'jstat';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { proposeLimits, proposeLimitsFromValues } from './limits';

describe('proposeLimits', () => {
  it('puts tolerance limits at mean ± kσ and guards them by U (ILAC-G8:09/2019, w = U)', () => {
    // self-constructed example: x̄ = 5.000 V, s = 0.020 V, k = 5 → 4.900 / 5.100 V; U = 10 mV → 4.910 / 5.090 V
    const p = proposeLimits({ mean: 5, sigma: 0.02, k: 5, uncertainty: 0.01 });
    expect(p.tolerance.low).toBeCloseTo(4.9, 12);
    expect(p.tolerance.high).toBeCloseTo(5.1, 12);
    expect(p.acceptance.low).toBeCloseTo(4.91, 12);
    expect(p.acceptance.high).toBeCloseTo(5.09, 12);
  });

  it('expected ppm outside follows the normal model (@stdlib and jStat normal cdf)', () => {
    const p = proposeLimits({ mean: 5, sigma: 0.02, k: 5, uncertainty: 0.01 });
    // outside ±5σ: 2·Φ(−5); outside the guarded ±4.5σ: 2·Φ(−4.5)
    expect(Math.abs(p.ppmOutsideTolerance.total - 2e6 * cdf(-5, 0, 1)) / (2e6 * cdf(-5, 0, 1))).toBeLessThan(1e-9);
    expect(Math.abs(p.ppmOutsideAcceptance.total - 2e6 * cdf(-4.5, 0, 1)) / (2e6 * cdf(-4.5, 0, 1))).toBeLessThan(1e-9);
    expect(p.ppmOutsideAcceptance.above).toBeCloseTo(1e6 * (1 - jStat.normal.cdf(5.09, 5, 0.02)), 6);
  });

  it('proposes one side only when asked', () => {
    const upper = proposeLimits({ mean: 22, sigma: 5, k: 4, uncertainty: 2, sides: 'upper' });
    expect(upper.tolerance).toEqual({ high: 42 });
    expect(upper.acceptance).toEqual({ high: 40 });
    expect(upper.ppmOutsideTolerance.below).toBe(0);
    expect(upper.ppmOutsideTolerance.above).toBeCloseTo(1e6 * cdf(-4, 0, 1), 9);
    const lower = proposeLimits({ mean: 88.2, sigma: 0.8, k: 3, uncertainty: 0.2, sides: 'lower' });
    expect(lower.tolerance.low).toBeCloseTo(85.8, 12);
    expect(lower.acceptance.low).toBeCloseTo(86.0, 12);
    expect(lower.tolerance.high).toBeUndefined();
  });

  it('computes mean and s from raw values (simple-statistics as reference)', () => {
    const values = [4.99, 5.01, 5.0, 5.02, 4.98, 5.005, 4.995, 5.0];
    const p = proposeLimitsFromValues(values, { k: 4, uncertainty: 0.005 });
    expect(p.n).toBe(8);
    expect(p.mean).toBeCloseTo(mean(values), 14);
    expect(p.sigma).toBeCloseTo(sampleStandardDeviation(values), 14);
    expect(p.tolerance.high).toBeCloseTo(mean(values) + 4 * sampleStandardDeviation(values), 12);
  });

  it('refuses a guard band that closes the acceptance zone and other bad input', () => {
    expect(() => proposeLimits({ mean: 5, sigma: 0.001, k: 3, uncertainty: 0.01 })).toThrow(/closes the acceptance zone/);
    expect(() => proposeLimits({ mean: 5, sigma: 0, k: 3, uncertainty: 0 })).toThrow(/do not vary/);
    expect(() => proposeLimits({ mean: 5, sigma: 1, k: -1, uncertainty: 0 })).toThrow(/k must be greater than 0/);
    expect(() => proposeLimits({ mean: 5, sigma: 1, k: 3, uncertainty: -1 })).toThrow(/0 or more/);
    expect(() => proposeLimits({ mean: 5, sigma: 1, k: 3, uncertainty: 0, sides: 'left' as never })).toThrow(/sides/);
  });
});
