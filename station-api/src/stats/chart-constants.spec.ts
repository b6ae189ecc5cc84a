import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { describe, expect, it } from 'vitest';
import { chartConstants } from './chart-constants';

/**
 * Exact constants by numerical integration, with @stdlib normal cdf as the reference Φ:
 * d2 = E(R) = ∫ [1 − Φⁿ − (1 − Φ)ⁿ] dx, and E(R²) = 2 ∬_{x<y} [1 − Φ(y)ⁿ − (1 − Φ(x))ⁿ + (Φ(y) − Φ(x))ⁿ] dx dy
 * (the distribution of the range of n normal observations, Tippett 1925, as the SAS/QC documentation on control
 * chart constants states it), d3 = √(E(R²) − d2²).
 */
function grid(step: number): number[] {
  return Array.from({ length: Math.round(16 / step) + 1 }, (_, i) => cdf(-8 + i * step, 0, 1));
}
const COARSE = { step: 0.02, phi: grid(0.02) };
const FINE = { step: 0.01, phi: grid(0.01) };

/** E(R) and E(R²) by the trapezoid rule on [−8, 8] (the integrands vanish at both ends). */
function moments(n: number, { step, phi }: { step: number; phi: number[] }): { er: number; er2: number } {
  let er = 0;
  for (const p of phi) er += 1 - p ** n - (1 - p) ** n;
  let er2 = 0;
  for (let j = 0; j < phi.length; j++) {
    const pj = phi[j];
    const a = 1 - pj ** n;
    for (let i = 0; i <= j; i++) er2 += (i === j ? 0.5 : 1) * (a - (1 - phi[i]) ** n + (pj - phi[i]) ** n);
  }
  return { er: er * step, er2: 2 * er2 * step * step };
}

const cache = new Map<number, { d2: number; d3: number }>();
function exactConstants(n: number): { d2: number; d3: number } {
  const hit = cache.get(n);
  if (hit) return hit;
  const c = moments(n, COARSE);
  const f = moments(n, FINE);
  // Richardson extrapolation of the O(h²) trapezoid error of the double integral
  const er2 = (4 * f.er2 - c.er2) / 3;
  const out = { d2: f.er, d3: Math.sqrt(er2 - f.er * f.er) };
  cache.set(n, out);
  return out;
}

describe('control chart constants (Montgomery, ISQC Appendix VI)', () => {
  it('agree with the exact values from the range distribution to the printed precision', () => {
    for (let n = 2; n <= 10; n++) {
      const k = chartConstants(n);
      const ex = exactConstants(n);
      // printed tables round to 3 decimals and disagree in the last digit (D4(3) 2.574 / 2.575), so ±0.001
      expect(Math.abs(k.d2 - ex.d2)).toBeLessThanOrEqual(0.0006);
      expect(Math.abs(k.d3 - ex.d3)).toBeLessThanOrEqual(0.001);
      // A2 = 3/(d2√n), D3 = max(0, 1 − 3d3/d2), D4 = 1 + 3d3/d2 (SAS/QC documentation, control chart constants)
      expect(Math.abs(k.A2 - 3 / (ex.d2 * Math.sqrt(n)))).toBeLessThanOrEqual(0.001);
      expect(Math.abs(k.D3 - Math.max(0, 1 - (3 * ex.d3) / ex.d2))).toBeLessThanOrEqual(0.001);
      expect(Math.abs(k.D4 - (1 + (3 * ex.d3) / ex.d2))).toBeLessThanOrEqual(0.001);
    }
  });

  it('agree with the 4- and 5-decimal values published elsewhere', () => {
    // 4-decimal "Table A.1 Shewhart constants" (appendix A, p. 286 of a control-chart text, seen quoted on a public
    // web page): d2(3) = 1.6926, d3(3) = 0.8884, D4(3) = 2.5746, d2(4) = 2.0588, d3(4) = 0.8798;
    // OriginLab LabTalk function reference, QCD2(4) returns 2.05875
    expect(exactConstants(3).d2).toBeCloseTo(1.6926, 4);
    expect(exactConstants(3).d3).toBeCloseTo(0.8884, 4);
    expect(1 + (3 * exactConstants(3).d3) / exactConstants(3).d2).toBeCloseTo(2.5746, 4);
    expect(exactConstants(4).d2).toBeCloseTo(2.05875, 5);
    expect(exactConstants(4).d3).toBeCloseTo(0.8798, 4);
    expect(Math.abs(chartConstants(3).D4 - 2.5746)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(chartConstants(4).d2 - 2.05875)).toBeLessThanOrEqual(0.0005);
  });

  it('E2 = 3/d2 gives the individuals-chart multiplier 2.66', () => {
    // Montgomery ISQC ch. 6: individuals limits x̄ ± 3·MR̄/1.128 ≈ x̄ ± 2.66·MR̄
    expect(chartConstants(2).E2).toBeCloseTo(2.66, 2);
  });

  it('refuses sizes outside 2..10', () => {
    expect(() => chartConstants(1)).toThrow(/from 2 to 10/);
    expect(() => chartConstants(11)).toThrow(/from 2 to 10/);
    expect(() => chartConstants(2.5)).toThrow(/whole number/);
  });
});
