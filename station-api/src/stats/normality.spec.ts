import { jStat } from 'jstat';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { sortedSample } from './histogram';
import { normalCdf, normalUpperTail } from './normal';
import { andersonDarling, andersonDarlingPValue } from './normality';

// Self-constructed example: 25 output-voltage readings (V), close to normal.
const NEAR_NORMAL = [
  5.012, 4.998, 5.005, 5.021, 4.994, 5.003, 5.017, 4.989, 5.008, 5.011, 5.026, 5.009, 5.015, 4.997, 5.019, 4.991,
  5.004, 5.013, 5.0, 4.986, 5.01, 5.024, 5.002, 5.016, 5.007,
];
// Self-constructed example: 15 strongly right-skewed values.
const SKEWED = [0.12, 0.15, 0.2, 0.21, 0.25, 0.3, 0.33, 0.4, 0.52, 0.7, 0.95, 1.4, 2.3, 3.9, 6.1];

/** A² from its definition (NIST/SEMATECH e-Handbook §1.3.5.14), with jStat.normal.cdf and simple-statistics. */
function referenceA2(xs: number[]): number {
  const n = xs.length;
  const m = mean(xs);
  const s = sampleStandardDeviation(xs);
  const y = [...xs].sort((a, b) => a - b);
  let sum = 0;
  for (let i = 1; i <= n; i++) {
    const fi = jStat.normal.cdf(y[i - 1], m, s);
    const fj = jStat.normal.cdf(y[n - i], m, s);
    sum += (2 * i - 1) * (Math.log(fi) + Math.log(1 - fj));
  }
  return -n - sum / n;
}

describe('Anderson–Darling statistic', () => {
  it('equals the defining formula evaluated with jStat and simple-statistics', () => {
    for (const xs of [NEAR_NORMAL, SKEWED]) {
      const r = andersonDarling(xs);
      expect(Math.abs(r.statistic - referenceA2(xs))).toBeLessThan(1e-10);
      expect(r.adjustedStatistic).toBeCloseTo(r.statistic * (1 + 0.75 / xs.length + 2.25 / xs.length ** 2), 14);
    }
  });

  it('agrees with SciPy', () => {
    // SciPy 1.17.1 scipy.stats.anderson(x, 'norm').statistic, computed by the author:
    // 0.10663819564360111 (NEAR_NORMAL), 2.059335388332414 (SKEWED)
    expect(andersonDarling(NEAR_NORMAL).statistic).toBeCloseTo(0.10663819564360111, 10);
    expect(andersonDarling(SKEWED).statistic).toBeCloseTo(2.059335388332414, 10);
  });
});

describe('Anderson–Darling on a large sample, one erfc per value (issue 12 speed)', () => {
  // self-constructed example: 3,001 values from a deterministic spread with tails out to |z| ≈ 7 and exact zeros
  const xs = Array.from({ length: 3001 }, (_, i) => 5 + 0.01 * Math.tan(((i - 1500) / 1501) * 1.5));

  it('gives the bits of the two-call form Σ(2i−1)[ln Φ(zᵢ) + ln(1 − Φ(z₍ₙ₊₁₋ᵢ₎))], and with a shared sort the same', () => {
    // NIST/SEMATECH e-Handbook §1.3.5.14 formula, Φ and 1 − Φ each by their own call (the previous code)
    const n = xs.length;
    const m = mean(xs);
    const s = sampleStandardDeviation(xs);
    const z = [...xs].sort((a, b) => a - b).map((x) => (x - m) / s);
    let sum = 0;
    for (let i = 0; i < n; i++) sum += (2 * i + 1) * (Math.log(normalCdf(z[i])) + Math.log(normalUpperTail(z[n - 1 - i])));
    const r = andersonDarling(xs);
    // simple-statistics mean/sd as reference may differ in the last bit from ours; the order of work may not
    expect(Math.abs(r.statistic - (-n - sum / n))).toBeLessThan(1e-9);
    expect(Math.abs(r.statistic - referenceA2(xs))).toBeLessThan(1e-6);
    expect(andersonDarling(xs, sortedSample(xs))).toEqual(r);
  });

  it('refuses a sorted copy that does not match the values', () => {
    expect(() => andersonDarling(xs, sortedSample(xs.slice(1)))).toThrow(RangeError);
  });
});

describe("p-value (D'Agostino & Stephens 1986)", () => {
  it('accepts near-normal data and rejects skewed data', () => {
    // SciPy 1.17.1 anderson(x, 'norm', method='interpolate').pvalue gives ≥ 0.15 and ≤ 0.01 for these two sets
    expect(andersonDarling(NEAR_NORMAL).pValue).toBeGreaterThan(0.15);
    expect(andersonDarling(SKEWED).pValue).toBeLessThan(0.01);
  });

  it('reaches the nominal levels at the asymptotic critical values of Stephens (1974)', () => {
    // Case 3 (mean and variance estimated) asymptotic critical values of A² for 15/10/5/2.5/1 %, as tabulated in
    // SciPy's scipy.stats.anderson (_Avals_norm = 0.561, 0.631, 0.752, 0.873, 1.035); at n = 1000 both
    // small-sample corrections are below 0.5 %
    const n = 1000;
    const table: Array<[number, number]> = [
      [0.561, 0.15],
      [0.631, 0.1],
      [0.752, 0.05],
      [0.873, 0.025],
      [1.035, 0.01],
    ];
    for (const [crit, level] of table) {
      const a = (crit / (1 + 4 / n - 25 / n ** 2)) * (1 + 0.75 / n + 2.25 / n ** 2);
      expect(Math.abs(andersonDarlingPValue(a) - level) / level).toBeLessThan(0.06);
    }
  });

  it('falls as the statistic grows, with no large jumps between the four formula pieces', () => {
    let prev = 1;
    for (let a = 0.01; a < 10; a += 0.01) {
      const p = andersonDarlingPValue(a);
      expect(p).toBeLessThanOrEqual(prev + 1e-12);
      prev = p;
    }
    for (const b of [0.2, 0.34, 0.6]) {
      expect(Math.abs(andersonDarlingPValue(b - 1e-9) - andersonDarlingPValue(b))).toBeLessThan(0.01);
    }
    expect(andersonDarlingPValue(200)).toBe(0);
  });
});

describe('bad input', () => {
  it('refuses fewer than 8 values, constant data and non-numbers', () => {
    expect(() => andersonDarling([1, 2, 3, 4, 5, 6, 7])).toThrow(/at least 8/);
    expect(() => andersonDarling(Array(10).fill(5))).toThrow(/vary/);
    expect(() => andersonDarling([1, 2, 3, 4, 5, 6, 7, Number.NaN])).toThrow(/finite/);
  });
});
