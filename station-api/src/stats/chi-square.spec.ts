import { jStat } from 'jstat';
import { chiSquaredDistributionTable, gamma } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { chiSquareCdf, chiSquareQuantile, gammaLn, gammaP } from './chi-square';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('gammaLn', () => {
  it('agrees with jStat.gammaln', () => {
    // jStat.gammaln as reference
    for (const a of [0.1, 0.5, 1, 1.5, 2, 3.2, 7.5, 14.5, 24.5, 99, 1000, 12345.5]) {
      expect(Math.abs(gammaLn(a) - jStat.gammaln(a))).toBeLessThan(1e-11 * Math.max(1, Math.abs(jStat.gammaln(a))));
    }
  });

  it('gives exact factorials and Γ(½) = √π', () => {
    // Γ(n) = (n − 1)!; Γ(1/2) = √π (Abramowitz & Stegun 6.1.8); simple-statistics gamma as second reference
    expect(gammaLn(1)).toBeCloseTo(0, 14);
    expect(gammaLn(5)).toBeCloseTo(Math.log(24), 13);
    expect(gammaLn(11)).toBeCloseTo(Math.log(3628800), 12);
    expect(gammaLn(0.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI)), 13);
    expect(rel(Math.exp(gammaLn(4.3)), gamma(4.3))).toBeLessThan(1e-9);
  });

  it('refuses a non-positive argument', () => {
    expect(() => gammaLn(0)).toThrow(RangeError);
    expect(() => gammaP(-1, 1)).toThrow(RangeError);
  });
});

describe('chi-square distribution', () => {
  it('cdf agrees with jStat.chisquare.cdf', () => {
    // jStat.chisquare.cdf as reference
    for (const df of [1, 2, 5, 29, 49, 99, 500]) {
      for (const q of [0.2, 0.6, 1, 1.4, 2]) {
        const x = q * df;
        expect(Math.abs(chiSquareCdf(x, df) - jStat.chisquare.cdf(x, df))).toBeLessThan(1e-10);
      }
    }
    expect(chiSquareCdf(0, 3)).toBe(0);
  });

  it('quantile agrees with jStat.chisquare.inv', () => {
    // jStat.chisquare.inv as reference
    for (const df of [1, 2, 5, 29, 49, 99, 999]) {
      for (const p of [0.005, 0.025, 0.05, 0.5, 0.95, 0.975, 0.995]) {
        expect(rel(chiSquareQuantile(p, df), jStat.chisquare.inv(p, df))).toBeLessThan(1e-9);
      }
    }
  });

  it('matches the printed chi-square table to its 3 decimals', () => {
    // simple-statistics chiSquaredDistributionTable (a printed table of upper-tail critical values) as reference
    const table = chiSquaredDistributionTable as unknown as Record<number, Record<number, number>>;
    for (const df of [1, 5, 10, 20, 30]) {
      for (const upper of [0.995, 0.975, 0.05, 0.01]) {
        const printed = table[df][upper];
        expect(Math.abs(chiSquareQuantile(1 - upper, df) - printed)).toBeLessThanOrEqual(0.0051);
      }
    }
  });

  it('refuses bad arguments', () => {
    expect(() => chiSquareQuantile(0, 5)).toThrow(/strictly between 0 and 1/);
    expect(() => chiSquareQuantile(0.5, 0)).toThrow(/degrees of freedom/);
  });
});
