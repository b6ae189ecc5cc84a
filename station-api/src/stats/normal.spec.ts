import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { jStat } from 'jstat';
import { cumulativeStdNormalProbability } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { erfc, normalCdf, normalPdf, normalQuantile, normalUpperTail, twoSidedZ } from './normal';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('normalCdf', () => {
  it('agrees with @stdlib normal cdf to 1e-13 relative from z = −37 to 8', () => {
    // @stdlib/stats-base-dists-normal-cdf as reference
    for (let z = -37; z <= 8; z += 0.0173) expect(rel(normalCdf(z), cdf(z, 0, 1))).toBeLessThan(1e-13);
  });

  it('agrees with jStat.normal.cdf in the body of the distribution', () => {
    // jStat.normal.cdf as reference (its 1 − cdf loses precision in the far upper tail, so the body only)
    for (let z = -6; z <= 6; z += 0.01) expect(Math.abs(normalCdf(z) - jStat.normal.cdf(z, 0, 1))).toBeLessThan(1e-14);
  });

  it('matches the printed standard normal table to its 4 decimals', () => {
    // simple-statistics cumulativeStdNormalProbability is a 4-decimal table lookup (steps of 0.01)
    for (const z of [0, 0.5, 1, 1.5, 1.96, 2, 2.5, 3]) {
      expect(Math.abs(normalCdf(z) - cumulativeStdNormalProbability(z))).toBeLessThanOrEqual(0.00005 + 1e-12);
    }
  });

  it('keeps full relative precision in the upper tail', () => {
    // @stdlib/stats-base-dists-normal-cdf as reference: Φ(−6) = 9.86587645e-10
    expect(rel(normalUpperTail(6), cdf(-6, 0, 1))).toBeLessThan(1e-13);
    expect(rel(normalUpperTail(20), cdf(-20, 0, 1))).toBeLessThan(1e-13);
    expect(normalUpperTail(-3)).toBeCloseTo(cdf(3, 0, 1), 15);
  });

  it('erfc agrees with jStat.erfc', () => {
    // jStat.erfc as reference (absolute: jStat's own approximation loses relative digits in the far tail)
    for (let x = -4; x <= 5; x += 0.05) expect(Math.abs(erfc(x) - jStat.erfc(x))).toBeLessThan(1e-14);
    // @stdlib normal cdf as second reference: erfc(x) = 2·Φ(−x√2)
    for (let x = -4; x <= 20; x += 0.05) expect(rel(erfc(x), 2 * cdf(-x * Math.SQRT2, 0, 1))).toBeLessThan(1e-13);
    expect(erfc(Infinity)).toBe(0);
    expect(erfc(-Infinity)).toBe(2);
    expect(Number.isNaN(erfc(NaN))).toBe(true);
  });

  it('pdf agrees with jStat.normal.pdf', () => {
    // jStat.normal.pdf as reference
    for (const z of [-3, -1, 0, 0.5, 2.2]) expect(rel(normalPdf(z), jStat.normal.pdf(z, 0, 1))).toBeLessThan(1e-14);
  });
});

describe('normalQuantile', () => {
  it('agrees with jStat.normal.inv between 1e-5 and 1 − 1e-5', () => {
    // jStat.normal.inv as reference
    for (const p of [1e-5, 0.001, 0.01, 0.025, 0.05, 0.1, 0.3, 0.5, 0.7, 0.9, 0.95, 0.975, 0.99, 0.999, 0.99999]) {
      expect(Math.abs(normalQuantile(p) - jStat.normal.inv(p, 0, 1))).toBeLessThan(1e-12);
    }
  });

  it('inverts @stdlib normal cdf, far tails included', () => {
    // @stdlib/stats-base-dists-normal-cdf as reference: Φ(Φ⁻¹(p)) = p
    for (const p of [1e-300, 1e-100, 1e-20, 1e-10, 1e-6, 0.0123, 0.4, 0.6, 0.9876]) {
      expect(rel(cdf(normalQuantile(p), 0, 1), p)).toBeLessThan(1e-12);
    }
  });

  it('gives the familiar critical values', () => {
    // jStat.normal.inv as reference for z at 90/95/99 % two-sided
    expect(twoSidedZ(0.95)).toBeCloseTo(jStat.normal.inv(0.975, 0, 1), 13);
    expect(twoSidedZ(0.9)).toBeCloseTo(jStat.normal.inv(0.95, 0, 1), 13);
    expect(twoSidedZ(0.99)).toBeCloseTo(jStat.normal.inv(0.995, 0, 1), 13);
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
  });

  it('refuses probabilities outside [0, 1] and confidence levels outside (0, 1)', () => {
    expect(() => normalQuantile(1.5)).toThrow(/between 0 and 1/);
    expect(() => normalQuantile(NaN)).toThrow(RangeError);
    expect(() => twoSidedZ(95)).toThrow(/e\.g\. 0\.95/);
    expect(() => twoSidedZ(1)).toThrow(RangeError);
  });
});
