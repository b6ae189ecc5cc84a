import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { jStat } from 'jstat';
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import {
  capability,
  capabilityFromSummary,
  cpInterval,
  cpkInterval,
  mean,
  ppmOutside,
  sampleStdDev,
  sigmaFromMovingRange,
  sigmaFromSubgroupRanges,
} from './capability';

// Self-constructed example: output voltage, 5 subgroups of 5 in production order, spec 5.000 ± 0.050 V.
const SUBGROUPS = [
  [5.012, 4.998, 5.005, 5.021, 4.994],
  [5.003, 5.017, 4.989, 5.008, 5.011],
  [5.026, 5.009, 5.015, 4.997, 5.019],
  [4.991, 5.004, 5.013, 5.0, 4.986],
  [5.01, 5.024, 5.002, 5.016, 5.007],
];
const VALUES = SUBGROUPS.flat();
const SPEC = { lsl: 4.95, usl: 5.05 };
const close = (a: number, b: number, relTol = 1e-12) => expect(Math.abs(a - b)).toBeLessThanOrEqual(Math.abs(b) * relTol);

describe('descriptive statistics', () => {
  it('mean and sample standard deviation agree with simple-statistics and jStat', () => {
    // simple-statistics mean / sampleStandardDeviation and jStat.stdev(x, true) as references
    close(mean(VALUES), ssMean(VALUES));
    close(sampleStdDev(VALUES), sampleStandardDeviation(VALUES));
    close(sampleStdDev(VALUES), jStat.stdev(VALUES, true));
    close(sampleStdDev(VALUES), 0.0108009259, 1e-8); // self-constructed example, value verified by the two libraries
  });

  it('within σ from the moving range and from subgroup ranges uses d2 of the constants table', () => {
    // Montgomery, ISQC Appendix VI: d2(2) = 1.128, d2(5) = 2.326
    const mr = VALUES.slice(1).map((v, i) => Math.abs(v - VALUES[i]));
    close(sigmaFromMovingRange(VALUES), ssMean(mr) / 1.128);
    close(sigmaFromSubgroupRanges(SUBGROUPS), 0.0266 / 2.326, 1e-10);
  });
});

describe('capability indices (NIST/SEMATECH e-Handbook §6.1.6 definitions)', () => {
  it('uses within σ for Cp/Cpk and overall s for Pp/Ppk (self-constructed example)', () => {
    const r = capability(VALUES, SPEC, { subgroupSize: 5 });
    const xbar = ssMean(VALUES); // simple-statistics as reference
    const s = sampleStandardDeviation(VALUES);
    const sw = 0.0266 / 2.326;
    close(r.mean, xbar);
    close(r.sigmaOverall, s);
    close(r.sigmaWithin, sw, 1e-10);
    close(r.cp!.value, 0.1 / (6 * sw), 1e-10);
    close(r.cpu!, (5.05 - xbar) / (3 * sw), 1e-10);
    close(r.cpl!, (xbar - 4.95) / (3 * sw), 1e-10);
    close(r.cpk.value, Math.min(r.cpu!, r.cpl!));
    close(r.pp!.value, 0.1 / (6 * s));
    close(r.ppk.value, (5.05 - xbar) / (3 * s));
    // the same figures to 6 decimals as an independent record of this example
    expect(r.cp!.value).toBeCloseTo(1.457393, 6);
    expect(r.cpk.value).toBeCloseTo(1.251027, 6);
    expect(r.pp!.value).toBeCloseTo(1.543078, 6);
    expect(r.ppk.value).toBeCloseTo(1.324578, 6);
    // here R̄/d2 exceeds s, so Ppk > Cpk: proves the two σ estimates are not swapped
    expect(r.ppk.value).toBeGreaterThan(r.cpk.value);
  });

  it('expected ppm from the normal model agrees with @stdlib and jStat normal cdf', () => {
    const r = capability(VALUES, SPEC, { subgroupSize: 5 });
    const xbar = ssMean(VALUES);
    const s = sampleStandardDeviation(VALUES);
    // @stdlib/stats-base-dists-normal-cdf as reference
    close(r.ppmOverall.above, 1e6 * cdf(-(5.05 - xbar) / s, 0, 1), 1e-12);
    close(r.ppmOverall.below, 1e6 * cdf((4.95 - xbar) / s, 0, 1), 1e-12);
    // jStat.normal.cdf as second reference
    close(r.ppmOverall.total, 1e6 * (1 - jStat.normal.cdf(5.05, xbar, s) + jStat.normal.cdf(4.95, xbar, s)), 1e-9);
    expect(r.ppmOverall.total).toBeCloseTo(35.44, 2);
  });

  it('handles an upper limit only: Cp undefined, Cpk = Cpu', () => {
    // self-constructed: ripple ≤ 50 mV, mean 22 mV, σ 5 mV → Cpu = 28/15; ppm = 1e6·Φ(−5.6) (@stdlib reference)
    const r = capabilityFromSummary({ n: 100, mean: 22, sigmaWithin: 5, sigmaOverall: 5 }, { usl: 50 });
    expect(r.cp).toBeNull();
    expect(r.pp).toBeNull();
    expect(r.cpl).toBeNull();
    close(r.cpk.value, 28 / 15);
    close(r.ppmWithin.above, 1e6 * cdf(-5.6, 0, 1), 1e-12);
    expect(r.ppmWithin.below).toBe(0);
  });

  it('handles a lower limit only: Cpk = Cpl', () => {
    // self-constructed: efficiency ≥ 85.0 %, mean 88.2 %, σ 0.8 % → Cpl = 4/3; ppm = 1e6·Φ(−4) = 31.67 (@stdlib)
    const r = capabilityFromSummary({ n: 100, mean: 88.2, sigmaWithin: 0.8, sigmaOverall: 0.8 }, { lsl: 85 });
    expect(r.cp).toBeNull();
    expect(r.cpu).toBeNull();
    close(r.cpk.value, 4 / 3, 1e-12);
    close(r.ppmWithin.total, 1e6 * cdf(-4, 0, 1), 1e-12);
    expect(r.ppmWithin.total).toBeCloseTo(31.671242, 5);
  });

  it('ppm follows the capability ↔ fallout relation of the normal model', () => {
    // Montgomery, ISQC ch. 8 (PCR and process fallout): one side ppm = 1e6·Φ(−3C); centred two-sided 2e6·Φ(−3Cp);
    // each checked with @stdlib normal cdf and jStat.normal.cdf
    for (const c of [0.5, 2 / 3, 1, 1.1, 4 / 3, 1.5, 2]) {
      const one = ppmOutside(0, 1, { usl: 3 * c });
      close(one.total, 1e6 * cdf(-3 * c, 0, 1), 1e-12);
      const two = ppmOutside(0, 1, { lsl: -3 * c, usl: 3 * c });
      close(two.total, 2e6 * (1 - jStat.normal.cdf(3 * c, 0, 1)), 1e-6);
    }
  });
});

describe('confidence intervals', () => {
  it('Cp and Pp: chi-square interval, checked with jStat.chisquare.inv', () => {
    // Cp·√(χ²_{α/2,n−1}/(n−1)) … Cp·√(χ²_{1−α/2,n−1}/(n−1)) (NIST/SEMATECH e-Handbook §6.1.6; Montgomery ch. 8)
    for (const [cp, n] of [[1, 30], [1.33, 50], [1.5, 100]]) {
      const ci = cpInterval(cp, n);
      close(ci.lower, cp * Math.sqrt(jStat.chisquare.inv(0.025, n - 1) / (n - 1)), 1e-9);
      close(ci.upper, cp * Math.sqrt(jStat.chisquare.inv(0.975, n - 1) / (n - 1)), 1e-9);
      expect(ci.method).toBe('chi-square');
    }
    // self-constructed record: n = 50, Cp = 1.33 → (1.06730, 1.59218)
    const ci = cpInterval(1.33, 50);
    expect(ci.lower).toBeCloseTo(1.0673, 4);
    expect(ci.upper).toBeCloseTo(1.59218, 4);
  });

  it('Cpk and Ppk: Bissell (1990), equal to the form Rodriguez (1992) prints', () => {
    // Bissell, Applied Statistics 39:331 (1990): Ĉ ± z·√(1/(9n) + Ĉ²/(2(n − 1)));
    // Rodriguez, J. Quality Technology 24:176 (1992): Ĉ·[1 ± z·√(1/(9nĈ²) + 1/(2(n − 1)))]; z from jStat.normal.inv
    const z = jStat.normal.inv(0.975, 0, 1);
    for (const [c, n] of [[1, 30], [1.33, 50], [1.5, 100], [0.8, 12]]) {
      const ci = cpkInterval(c, n);
      const h = z * Math.sqrt(1 / (9 * n * c * c) + 1 / (2 * (n - 1)));
      close(ci.lower, c * (1 - h), 1e-12);
      close(ci.upper, c * (1 + h), 1e-12);
      expect(ci.method).toBe('Bissell normal approximation');
    }
    // self-constructed record: n = 50, Cpk = 1.33 → (1.05094, 1.60906)
    expect(cpkInterval(1.33, 50).lower).toBeCloseTo(1.05094, 5);
    expect(cpkInterval(1.33, 50).upper).toBeCloseTo(1.60906, 5);
  });

  it('widens with the confidence level', () => {
    const c95 = cpkInterval(1.2, 40, 0.95);
    const c99 = cpkInterval(1.2, 40, 0.99);
    expect(c99.lower).toBeLessThan(c95.lower);
    expect(c99.upper).toBeGreaterThan(c95.upper);
  });
});

describe('bad input', () => {
  it('refuses missing, crossed or non-finite limits, too few values and zero spread', () => {
    expect(() => capability(VALUES, {})).toThrow(/lower limit, an upper limit or both/);
    expect(() => capability(VALUES, { lsl: 5.1, usl: 5.0 })).toThrow(/must be below/);
    expect(() => capability([5], SPEC)).toThrow(/at least 2/);
    expect(() => capability([5, 5, 5], SPEC)).toThrow(/do not vary/);
    expect(() => capability([5, NaN, 5.1], SPEC)).toThrow(/finite/);
    expect(() => capability(VALUES, SPEC, { subgroupSize: 11 })).toThrow(/subgroup size/);
  });
});
