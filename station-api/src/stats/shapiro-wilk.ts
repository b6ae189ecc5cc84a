import { requireFiniteArray } from '../measure/guards';
import { normalQuantile, normalUpperTail } from './normal';

/**
 * Shapiro–Wilk test of normality (S. S. Shapiro & M. B. Wilk, Biometrika 52:591–611, 1965), computed with
 * Royston's approximations for the coefficients and the p-value: P. Royston, "Remark AS R94: a remark on
 * algorithm AS 181, the W-test for normality", Applied Statistics 44(4):547–551, 1995 — the algorithm behind
 * R's shapiro.test and SciPy's scipy.stats.shapiro. Valid for 3 ≤ n ≤ 5000.
 *
 * W = (Σ aᵢ·(x₍ₙ₊₁₋ᵢ₎ − x₍ᵢ₎))² / Σ (xᵢ − x̄)², i = 1..⌊n/2⌋.
 * Coefficients: mᵢ = Φ⁻¹((i − 3/8)/(n + 1/4)); the two outermost from Royston's polynomials in 1/√n, the rest
 * mᵢ scaled so that Σa² = 1. p-value: log(1 − W) (n ≥ 12) or −log(γ − log(1 − W)) (4 ≤ n ≤ 11) is close to
 * normal with mean and σ given by Royston's polynomials; n = 3 has an exact p-value.
 * Small p (e.g. < 0.05) is evidence against normality. Like every normality test, heavily rounded readings
 * (many ties) push W down.
 */

export interface ShapiroWilkResult {
  n: number;
  /** W, 0..1; near 1 for normal data */
  statistic: number;
  pValue: number;
  method: 'Shapiro–Wilk, Royston (1995) AS R94';
}

// Royston (1995) polynomial coefficients, ascending powers.
const C1 = [0, 0.221157, -0.147981, -2.07119, 4.434685, -2.706056];
const C2 = [0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633];
const C3 = [0.544, -0.39978, 0.025054, -6.714e-4];
const C4 = [1.3822, -0.77857, 0.062767, -0.0020322];
const C5 = [-1.5861, -0.31082, -0.083751, 0.0038915];
const C6 = [-0.4803, -0.082676, 0.0030302];
const G = [-2.273, 0.459];

const poly = (c: readonly number[], x: number) => c.reduceRight((acc, ci) => acc * x + ci, 0);

/** Coefficients a₁ ≥ a₂ ≥ … for the lower half of the ordered sample (a₁ pairs the extremes). */
export function shapiroWilkCoefficients(n: number): number[] {
  if (!(Number.isInteger(n) && n >= 3 && n <= 5000)) throw new RangeError(`Shapiro–Wilk needs 3 to 5000 values, got ${n}`);
  const half = Math.floor(n / 2);
  if (n === 3) return [Math.SQRT1_2];
  const m = Array.from({ length: half }, (_, i) => normalQuantile((i + 1 - 0.375) / (n + 0.25)));
  const summ2 = 2 * m.reduce((a, v) => a + v * v, 0);
  const ssumm2 = Math.sqrt(summ2);
  const rsn = 1 / Math.sqrt(n);
  const a = m.map((v) => v);
  const a1 = poly(C1, rsn) - m[0] / ssumm2;
  let first: number;
  let fac: number;
  if (n > 5) {
    const a2 = -m[1] / ssumm2 + poly(C2, rsn);
    fac = Math.sqrt((summ2 - 2 * m[0] ** 2 - 2 * m[1] ** 2) / (1 - 2 * a1 ** 2 - 2 * a2 ** 2));
    a[1] = a2;
    first = 2;
  } else {
    fac = Math.sqrt((summ2 - 2 * m[0] ** 2) / (1 - 2 * a1 ** 2));
    first = 1;
  }
  a[0] = a1;
  for (let i = first; i < half; i++) a[i] = -m[i] / fac;
  return a;
}

/**
 * Shapiro–Wilk test.
 * @param values 3 to 5000 finite values, any unit
 * @throws RangeError outside that size or when all values are equal
 */
export function shapiroWilk(values: readonly number[]): ShapiroWilkResult {
  requireFiniteArray('values', values, 3);
  const n = values.length;
  const a = shapiroWilkCoefficients(n);
  const x = [...values].sort((p, q) => p - q);
  const mean = x.reduce((s, v) => s + v, 0) / n;
  const ss = x.reduce((s, v) => s + (v - mean) * (v - mean), 0);
  if (!(ss > 0)) throw new RangeError('all values are equal: a normality test needs values that vary');
  let b = 0;
  for (let i = 0; i < a.length; i++) b += a[i] * (x[n - 1 - i] - x[i]);
  const w = Math.min(1, (b * b) / ss);
  return { n, statistic: w, pValue: pValueOf(w, n), method: 'Shapiro–Wilk, Royston (1995) AS R94' };
}

function pValueOf(w: number, n: number): number {
  if (n === 3) {
    // exact for n = 3: p = (6/π)·(asin(√W) − asin(√(3/4)))
    return Math.min(1, Math.max(0, (6 / Math.PI) * (Math.asin(Math.sqrt(w)) - Math.asin(Math.sqrt(0.75)))));
  }
  const w1 = Math.log(1 - w);
  if (!Number.isFinite(w1)) return 1; // W = 1: a perfect straight line on the normal plot
  if (n <= 11) {
    const gamma = poly(G, n);
    if (w1 >= gamma) return 0; // beyond the approximation's range, far below any decision level
    const y = -Math.log(gamma - w1);
    return normalUpperTail((y - poly(C3, n)) / Math.exp(poly(C4, n)));
  }
  const ln = Math.log(n);
  return normalUpperTail((w1 - poly(C5, ln)) / Math.exp(poly(C6, ln)));
}
