import { jStat } from 'jstat';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { analyseQuantity } from './characterization-analysis';

// Shapiro & Wilk, Biometrika 52 (1965), worked example: weights (lb) of 11 men, in the order printed there
const WEIGHTS_LB = [148, 154, 158, 160, 161, 162, 166, 170, 182, 195, 236];
// Self-constructed example: 25 output-voltage readings (V) in build order
const VOUT_V = [
  5.012, 4.998, 5.005, 5.021, 4.994, 5.003, 5.017, 4.989, 5.008, 5.011, 5.026, 5.009, 5.015, 4.997, 5.019, 4.991,
  5.004, 5.013, 5.0, 4.986, 5.01, 5.024, 5.002, 5.016, 5.007,
];

/** MR̄/d2 with d2 = 1.128 for ranges of two (Montgomery, Introduction to SQC, Appendix VI, n = 2). */
function movingRangeSigma(xs: number[]): number {
  let s = 0;
  for (let i = 1; i < xs.length; i++) s += Math.abs(xs[i] - xs[i - 1]);
  return s / (xs.length - 1) / 1.128;
}

describe('analyseQuantity', () => {
  it('mean and s agree with simple-statistics; empty cells are counted as missing', () => {
    const a = analyseQuantity([...VOUT_V, null, null]);
    expect(a.n).toBe(25);
    expect(a.missing).toBe(2);
    expect(a.mean).toBeCloseTo(mean(VOUT_V), 12); // simple-statistics mean as reference
    expect(a.sd).toBeCloseTo(sampleStandardDeviation(VOUT_V), 12); // simple-statistics sampleStandardDeviation as reference
    expect(a.min).toBe(4.986);
    expect(a.max).toBe(5.026);
    expect(a.histogram!.counts.reduce((x, y) => x + y, 0)).toBe(25);
  });

  it('Cpk by the handbook formula with the moving-range σ, Ppk with s (NIST/SEMATECH e-Handbook §6.1.6)', () => {
    const a = analyseQuantity(VOUT_V, { low: 4.95, high: 5.05 });
    const m = mean(VOUT_V);
    const s = sampleStandardDeviation(VOUT_V);
    const sw = movingRangeSigma(VOUT_V);
    // Cpk = min(USL − μ, μ − LSL)/(3σ) (NIST/SEMATECH e-Handbook §6.1.6)
    expect(a.capability!.cpk.value).toBeCloseTo(Math.min(5.05 - m, m - 4.95) / (3 * sw), 10);
    expect(a.capability!.ppk.value).toBeCloseTo(Math.min(5.05 - m, m - 4.95) / (3 * s), 10);
    expect(a.capability!.cp!.value).toBeCloseTo(0.1 / (6 * sw), 10);
    // expected fraction outside, normal model N(x̄, s): jStat.normal.cdf as reference
    const expected = 1e6 * (jStat.normal.cdf(4.95, m, s) + 1 - jStat.normal.cdf(5.05, m, s));
    expect(Math.abs(a.ppmOutside!.total - expected) / expected).toBeLessThan(1e-6);
  });

  it('one-sided proposal: Cpk = Cpu, Cp undefined, ppm from the upper tail only', () => {
    const a = analyseQuantity(VOUT_V, { high: 5.05 });
    const m = mean(VOUT_V);
    expect(a.capability!.cp).toBeNull();
    expect(a.capability!.cpk.value).toBeCloseTo((5.05 - m) / (3 * movingRangeSigma(VOUT_V)), 10);
    expect(a.ppmOutside!.below).toBe(0);
    expect(a.ppmOutside!.above).toBeCloseTo(1e6 * (1 - jStat.normal.cdf(5.05, m, sampleStandardDeviation(VOUT_V))), 6);
  });

  it("normality: Shapiro & Wilk's 1965 worked example reads as not normal", () => {
    const a = analyseQuantity(WEIGHTS_LB);
    // Shapiro & Wilk (1965) worked example: W = 0.79 (from memory, unverified); SciPy 1.17.1 scipy.stats.shapiro:
    // W = 0.7888146948631716, p = 0.006703814061898823 (computed by the author of src/stats/shapiro-wilk.spec.ts)
    expect(a.normality.shapiroWilk!.statistic).toBeCloseTo(0.7888146948631716, 5);
    expect(a.normality.shapiroWilk!.pValue).toBeCloseTo(0.0067038, 4);
    expect(a.normality.primary!.test).toBe('Anderson–Darling');
    expect(a.normality.primary!.pValue).toBeLessThan(0.05);
    expect(a.normality.reading).toMatch(/do not look normal/);
    expect(analyseQuantity(VOUT_V).normality.reading).toMatch(/No evidence against normality/);
  });

  it('suggests x̄ ± k·s limits guarded by U (src/stats/limits.ts, ILAC-G8:09/2019 w = U)', () => {
    const a = analyseQuantity(VOUT_V, { k: 3, uncertainty: 0.005 });
    const m = mean(VOUT_V);
    const s = sampleStandardDeviation(VOUT_V);
    expect(a.suggestion!.tolerance.low).toBeCloseTo(m - 3 * s, 12);
    expect(a.suggestion!.acceptance.high).toBeCloseTo(m + 3 * s - 0.005, 12);
    expect(a.suggestion!.k).toBe(3);
    // default k = 4: the suggestion's Ppk is 4/3
    const d = analyseQuantity(VOUT_V);
    expect((d.suggestion!.tolerance.high! - m) / (3 * s)).toBeCloseTo(4 / 3, 12);
  });

  it('says why figures are missing instead of failing', () => {
    expect(analyseQuantity([5, 5, 5, 5]).problems.join(' ')).toMatch(/All values are equal/);
    expect(analyseQuantity([5.01, 5.02, 5.0], { low: 4.9 }).problems.join(' ')).toMatch(/at least 8 values/);
    expect(analyseQuantity(VOUT_V).problems.join(' ')).toMatch(/Propose a low limit/);
    expect(analyseQuantity([5]).sd).toBeNull();
    expect(() => analyseQuantity(VOUT_V, { low: 5.1, high: 5.0 })).toThrow(/must be below/);
  });
});
