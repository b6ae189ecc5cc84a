import { requireFiniteArray } from '../measure/guards';
import { mean, sampleStdDev } from './capability';
import { sortedSample } from './histogram';
import { erfc } from './normal';

/**
 * Anderson–Darling test of normality with mean and variance estimated from the data ("case 3").
 *
 * Statistic (T. W. Anderson & D. A. Darling, 1952/1954; NIST/SEMATECH e-Handbook §1.3.5.14), with the values
 * sorted, zᵢ = (x₍ᵢ₎ − x̄)/s and s the sample standard deviation (n − 1):
 *   A² = −n − (1/n)·Σᵢ (2i − 1)·[ln Φ(zᵢ) + ln(1 − Φ(z₍ₙ₊₁₋ᵢ₎))]
 * Small-sample adjustment and p-value: R. B. D'Agostino & M. A. Stephens (eds.), Goodness-of-Fit Techniques,
 * Marcel Dekker 1986, ch. 4 (Table 4.9), as implemented in the R package nortest (ad.test):
 *   A*² = A²·(1 + 0.75/n + 2.25/n²)
 *   A*² < 0.2:        p = 1 − exp(−13.436 + 101.14·A*² − 223.73·A*⁴)
 *   0.2 ≤ A*² < 0.34: p = 1 − exp(−8.318 + 42.796·A*² − 59.938·A*⁴)
 *   0.34 ≤ A*² < 0.6: p = exp(0.9177 − 4.279·A*² − 1.38·A*⁴)
 *   A*² ≥ 0.6:        p = exp(1.2937 − 5.709·A*² + 0.0186·A*⁴)
 * A small p-value (e.g. below 0.05) is evidence against normality; a large one does not prove normality.
 * Ties and rounded readings inflate A²: coarse instrument resolution alone can make a normal process "fail".
 */

export interface AndersonDarlingResult {
  n: number;
  /** A², unadjusted */
  statistic: number;
  /** A*², adjusted for sample size */
  adjustedStatistic: number;
  /** approximate p-value, 0..1 */
  pValue: number;
  method: "Anderson–Darling, p-value by D'Agostino & Stephens (1986)";
}

/** Smallest sample the p-value approximation is used for (the R package nortest uses the same bound). */
export const MIN_AD_SAMPLE = 8;

/** p-value of the adjusted statistic A*² (D'Agostino & Stephens 1986). */
export function andersonDarlingPValue(adjusted: number): number {
  const a = adjusted;
  let p: number;
  if (a < 0.2) p = 1 - Math.exp(-13.436 + 101.14 * a - 223.73 * a * a);
  else if (a < 0.34) p = 1 - Math.exp(-8.318 + 42.796 * a - 59.938 * a * a);
  else if (a < 0.6) p = Math.exp(0.9177 - 4.279 * a - 1.38 * a * a);
  // the last quadratic turns upward at A*² ≈ 153 (p there ≈ 1e-190); beyond it the p-value is simply 0
  else if (a < 153) p = Math.exp(1.2937 - 5.709 * a + 0.0186 * a * a);
  else p = 0;
  return Math.min(1, Math.max(0, p));
}

/**
 * Anderson–Darling normality test.
 * @param values at least 8 finite values, any unit
 * @param sorted the same values in ascending order when the caller has them already (from sortedSample)
 * @throws RangeError for fewer than 8 values or values that do not vary
 */
export function andersonDarling(values: readonly number[], sorted?: ArrayLike<number>): AndersonDarlingResult {
  requireFiniteArray('values', values, MIN_AD_SAMPLE);
  const n = values.length;
  const m = mean(values);
  const s = sampleStdDev(values);
  if (!(s > 0)) throw new RangeError('all values are equal: a normality test needs values that vary');
  const x = sorted ?? sortedSample(values);
  if (x.length !== n) throw new RangeError(`sorted holds ${x.length} values, values ${n}`);
  // ln Φ(zᵢ) and ln(1 − Φ(zᵢ)) from ONE erfc each: Φ(z) = 1 − ½erfc(z/√2) and 1 − Φ(z) = ½erfc(z/√2) for z ≥ 0,
  // mirrored for z < 0 — the same arithmetic normalCdf and normalUpperTail do, so the same bits, half the work.
  // The upper tail keeps precision where Φ(z) rounds to 1.
  const lnCdf = new Float64Array(n);
  const lnUpper = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const z = (x[i] - m) / s;
    const half = 0.5 * erfc(Math.abs(z) / Math.SQRT2);
    lnCdf[i] = Math.log(z < 0 ? half : 1 - half);
    lnUpper[i] = Math.log(z > 0 ? half : 1 - half);
  }
  let sum = 0;
  for (let i = 0; i < n; i++) sum += (2 * i + 1) * (lnCdf[i] + lnUpper[n - 1 - i]);
  const statistic = -n - sum / n;
  const adjustedStatistic = statistic * (1 + 0.75 / n + 2.25 / (n * n));
  return {
    n,
    statistic,
    adjustedStatistic,
    pValue: andersonDarlingPValue(adjustedStatistic),
    method: "Anderson–Darling, p-value by D'Agostino & Stephens (1986)",
  };
}
