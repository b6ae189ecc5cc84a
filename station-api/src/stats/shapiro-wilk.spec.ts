import { describe, expect, it } from 'vitest';
import { shapiroWilk, shapiroWilkCoefficients } from './shapiro-wilk';

// Self-constructed data sets (the first is 25 output-voltage readings in V).
const NEAR_NORMAL = [
  5.012, 4.998, 5.005, 5.021, 4.994, 5.003, 5.017, 4.989, 5.008, 5.011, 5.026, 5.009, 5.015, 4.997, 5.019, 4.991,
  5.004, 5.013, 5.0, 4.986, 5.01, 5.024, 5.002, 5.016, 5.007,
];
const SKEWED = [0.12, 0.15, 0.2, 0.21, 0.25, 0.3, 0.33, 0.4, 0.52, 0.7, 0.95, 1.4, 2.3, 3.9, 6.1];
const TEN = [2.1, 3.4, 1.9, 5.6, 4.4, 3.3, 2.8, 3.9, 4.1, 3.0];
const FIVE = [3.1, 2.2, 5.5, 4.0, 1.9];

describe('Shapiro–Wilk (Royston 1995, AS R94)', () => {
  it("reproduces Shapiro & Wilk's 1965 worked example: W ≈ 0.79 for the weights of 11 men", () => {
    // Shapiro & Wilk, Biometrika 52 (1965), worked example (weights in lb): W = 0.79 — recalled from memory,
    // unverified against the paper; SciPy 1.17.1 scipy.stats.shapiro gives W = 0.7888146948631716,
    // p = 0.006703814061898823 (computed by the author)
    const r = shapiroWilk([148, 154, 158, 160, 161, 162, 166, 170, 182, 195, 236]);
    expect(r.statistic).toBeCloseTo(0.79, 2);
    expect(r.statistic).toBeCloseTo(0.7888146948631716, 5);
    expect(Math.abs(r.pValue - 0.006703814061898823) / 0.006703814061898823).toBeLessThan(1e-3);
  });

  it('agrees with SciPy on small and larger samples', () => {
    // SciPy 1.17.1 scipy.stats.shapiro (the same AS R94 algorithm, partly in single precision), computed by the
    // author: [W, p]
    const cases: Array<[number[], number, number]> = [
      [NEAR_NORMAL, 0.9837568870184781, 0.9480511755240679],
      [SKEWED, 0.6660107501971011, 0.000110107014780465],
      [TEN, 0.9713906031045022, 0.9034305013349915],
      [FIVE, 0.9367995144413536, 0.6434085808746619],
      [[1, 2, 4], 0.9642857142857142, 0.6368868450289689],
    ];
    for (const [xs, w, p] of cases) {
      const r = shapiroWilk(xs);
      expect(r.statistic).toBeCloseTo(w, 5);
      expect(Math.abs(r.pValue - p) / p).toBeLessThan(2e-3);
    }
  });

  it('has unit-length coefficients, largest for the extremes', () => {
    for (const n of [3, 4, 5, 6, 11, 12, 50, 500]) {
      const a = shapiroWilkCoefficients(n);
      expect(2 * a.reduce((s, v) => s + v * v, 0)).toBeCloseTo(1, 6);
      for (let i = 1; i < a.length; i++) expect(a[i]).toBeLessThan(a[i - 1]);
    }
  });

  it('refuses too few values and constant data', () => {
    expect(() => shapiroWilk([1, 2])).toThrow(/at least 3/);
    expect(() => shapiroWilk([2, 2, 2, 2])).toThrow(/vary/);
  });
});
