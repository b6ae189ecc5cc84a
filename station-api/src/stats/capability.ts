import { requireFinite, requireFiniteArray } from '../measure/guards';
import { chartConstants } from './chart-constants';
import { chiSquareQuantile } from './chi-square';
import { normalCdf, normalUpperTail, twoSidedZ } from './normal';

/**
 * Process capability of one quantity against its specification limits.
 *
 * Definitions: NIST/SEMATECH e-Handbook §6.1.6 "What is process capability?"; Montgomery, Introduction to
 * Statistical Quality Control, ch. 8.
 *   Cp = (USL − LSL)/(6σ), Cpu = (USL − μ)/(3σ), Cpl = (μ − LSL)/(3σ), Cpk = min(Cpu, Cpl).
 * Two estimates of σ give two families of indices:
 * - Cp, Cpk use the within-subgroup (short-term) σ: MR̄/d2 for individuals, R̄/d2 for subgroups;
 * - Pp, Ppk use the overall sample standard deviation s (divisor n − 1), the long-term spread.
 * With one limit only, Cp and Pp are undefined (null) and Cpk = Cpu or Cpl (Ppk likewise).
 *
 * Confidence intervals, two-sided at the chosen level, ν = n − 1 degrees of freedom:
 * - Cp and Pp: Ĉ·√(χ²_{α/2,ν}/ν) … Ĉ·√(χ²_{1−α/2,ν}/ν), exact for Pp under normality (s²·ν/σ² ~ χ²_ν);
 *   for Cp, whose σ comes from ranges, the same ν is an approximation (common practice).
 * - Cpk and Ppk: Bissell's normal approximation (A. F. Bissell, "How reliable is your capability index?",
 *   Applied Statistics 39(3):331–340, 1990): Ĉ ± z_{1−α/2}·√(1/(9n) + Ĉ²/(2ν)).
 * Expected fraction outside the limits, from the normal model N(x̄, σ): above = 1 − Φ((USL − x̄)/σ),
 * below = Φ((LSL − x̄)/σ), in parts per million; given for both σ estimates.
 * The model assumes a stable, normal process; check normality (normality.ts) and stability (control-chart.ts) first.
 */

export interface SpecLimits {
  /** lower specification limit, same unit as the data; absent for an upper-only limit */
  lsl?: number;
  /** upper specification limit, same unit as the data; absent for a lower-only limit */
  usl?: number;
}

export interface IndexEstimate {
  value: number;
  lower: number;
  upper: number;
  confidence: number;
  method: 'chi-square' | 'Bissell normal approximation';
}

export interface PpmOutside {
  below: number;
  above: number;
  total: number;
}

export interface CapabilityReport {
  n: number;
  mean: number;
  sigmaWithin: number;
  sigmaOverall: number;
  cp: IndexEstimate | null;
  cpu: number | null;
  cpl: number | null;
  cpk: IndexEstimate;
  pp: IndexEstimate | null;
  ppu: number | null;
  ppl: number | null;
  ppk: IndexEstimate;
  /** expected ppm outside the limits with the within-subgroup σ (what Cpk describes) */
  ppmWithin: PpmOutside;
  /** expected ppm outside the limits with the overall σ (what Ppk describes) */
  ppmOverall: PpmOutside;
}

/** Arithmetic mean. */
export function mean(values: readonly number[]): number {
  requireFiniteArray('values', values, 1);
  return values.reduce((a, b) => a + b, 0) / values.length;
}

/** Sample standard deviation s with divisor n − 1 (two-pass, for accuracy on values with a large offset). */
export function sampleStdDev(values: readonly number[]): number {
  requireFiniteArray('values', values, 2);
  const m = mean(values);
  const ss = values.reduce((a, v) => a + (v - m) * (v - m), 0);
  return Math.sqrt(ss / (values.length - 1));
}

/** Within σ for individuals: average moving range of two / d2 (d2 = 1.128). Needs at least 2 values. */
export function sigmaFromMovingRange(values: readonly number[]): number {
  requireFiniteArray('values', values, 2);
  let sum = 0;
  for (let i = 1; i < values.length; i++) sum += Math.abs(values[i] - values[i - 1]);
  return sum / (values.length - 1) / chartConstants(2).d2;
}

/** Within σ for subgroups of equal size n = 2..10: R̄/d2. */
export function sigmaFromSubgroupRanges(subgroups: readonly (readonly number[])[]): number {
  if (!Array.isArray(subgroups) || subgroups.length < 1) throw new RangeError('at least one subgroup is needed');
  const n = subgroups[0].length;
  const { d2 } = chartConstants(n);
  let sum = 0;
  subgroups.forEach((g, i) => {
    requireFiniteArray(`subgroups[${i}]`, g, 1);
    if (g.length !== n) throw new RangeError(`subgroup ${i + 1} has ${g.length} values but the first has ${n}`);
    sum += Math.max(...g) - Math.min(...g);
  });
  return sum / subgroups.length / d2;
}

function checkLimits(limits: SpecLimits): void {
  if (!limits || (limits.lsl === undefined && limits.usl === undefined)) {
    throw new RangeError('capability needs a lower limit, an upper limit or both');
  }
  if (limits.lsl !== undefined) requireFinite('lsl', limits.lsl);
  if (limits.usl !== undefined) requireFinite('usl', limits.usl);
  if (limits.lsl !== undefined && limits.usl !== undefined && !(limits.lsl < limits.usl)) {
    throw new RangeError(`lower limit ${limits.lsl} must be below upper limit ${limits.usl}`);
  }
}

/** Exact (normal theory) interval for Cp or Pp from the chi-square distribution with ν = n − 1. */
export function cpInterval(cp: number, n: number, confidence = 0.95): IndexEstimate {
  const nu = n - 1;
  const alpha = 1 - confidence;
  twoSidedZ(confidence); // validates the level
  return {
    value: cp,
    lower: cp * Math.sqrt(chiSquareQuantile(alpha / 2, nu) / nu),
    upper: cp * Math.sqrt(chiSquareQuantile(1 - alpha / 2, nu) / nu),
    confidence,
    method: 'chi-square',
  };
}

/** Bissell (1990) normal-approximation interval for Cpk or Ppk (also valid for a one-sided Cpu/Cpl). */
export function cpkInterval(cpk: number, n: number, confidence = 0.95): IndexEstimate {
  const z = twoSidedZ(confidence);
  const half = z * Math.sqrt(1 / (9 * n) + (cpk * cpk) / (2 * (n - 1)));
  return { value: cpk, lower: cpk - half, upper: cpk + half, confidence, method: 'Bissell normal approximation' };
}

/**
 * Expected parts per million outside the limits for a normal process N(mu, sigma).
 * @param mu process mean, unit of the limits
 * @param sigma process standard deviation, same unit, > 0
 */
export function ppmOutside(mu: number, sigma: number, limits: SpecLimits): PpmOutside {
  requireFinite('mean', mu);
  requireFinite('sigma', sigma);
  if (!(sigma > 0)) throw new RangeError(`sigma must be greater than 0, got ${sigma}`);
  checkLimits(limits);
  const above = limits.usl === undefined ? 0 : 1e6 * normalUpperTail((limits.usl - mu) / sigma);
  const below = limits.lsl === undefined ? 0 : 1e6 * normalCdf((limits.lsl - mu) / sigma);
  return { below, above, total: above + below };
}

export interface CapabilitySummary {
  n: number;
  mean: number;
  sigmaWithin: number;
  sigmaOverall: number;
}

/**
 * Capability indices with intervals and expected ppm from summary figures.
 * @param s sample size n ≥ 2, mean, within σ and overall σ (both > 0), all in the unit of the limits
 * @throws RangeError on missing or inconsistent limits, n < 2, or a σ of 0 (no spread: the indices are undefined)
 */
export function capabilityFromSummary(s: CapabilitySummary, limits: SpecLimits, confidence = 0.95): CapabilityReport {
  checkLimits(limits);
  requireFinite('n', s.n);
  if (!Number.isInteger(s.n) || s.n < 2) throw new RangeError(`capability needs at least 2 values, got ${s.n}`);
  requireFinite('mean', s.mean);
  for (const [name, v] of [['within-subgroup sigma', s.sigmaWithin], ['overall sigma', s.sigmaOverall]] as const) {
    requireFinite(name, v);
    if (!(v > 0)) throw new RangeError(`${name} is ${v}: the values do not vary, so capability indices are undefined`);
  }
  const { lsl, usl } = limits;
  const family = (sigma: number) => {
    const upper = usl === undefined ? null : (usl - s.mean) / (3 * sigma);
    const lower = lsl === undefined ? null : (s.mean - lsl) / (3 * sigma);
    const both = lsl !== undefined && usl !== undefined ? (usl - lsl) / (6 * sigma) : null;
    const k = Math.min(upper ?? Infinity, lower ?? Infinity);
    return {
      potential: both === null ? null : cpInterval(both, s.n, confidence),
      upper,
      lower,
      k: cpkInterval(k, s.n, confidence),
    };
  };
  const w = family(s.sigmaWithin);
  const o = family(s.sigmaOverall);
  return {
    n: s.n,
    mean: s.mean,
    sigmaWithin: s.sigmaWithin,
    sigmaOverall: s.sigmaOverall,
    cp: w.potential,
    cpu: w.upper,
    cpl: w.lower,
    cpk: w.k,
    pp: o.potential,
    ppu: o.upper,
    ppl: o.lower,
    ppk: o.k,
    ppmWithin: ppmOutside(s.mean, s.sigmaWithin, limits),
    ppmOverall: ppmOutside(s.mean, s.sigmaOverall, limits),
  };
}

/**
 * Capability of raw values. Within σ from the moving range of consecutive values (subgroupSize 1, the default)
 * or from R̄/d2 over consecutive subgroups of subgroupSize (2..10; a trailing incomplete subgroup is left out of
 * the within σ but kept in the mean and overall σ).
 * @param values measured values in production order
 */
export function capability(
  values: readonly number[],
  limits: SpecLimits,
  options: { subgroupSize?: number; confidence?: number } = {},
): CapabilityReport {
  requireFiniteArray('values', values, 2);
  const size = options.subgroupSize ?? 1;
  let sigmaWithin: number;
  if (size === 1) sigmaWithin = sigmaFromMovingRange(values);
  else {
    chartConstants(size);
    const groups: number[][] = [];
    for (let i = 0; i + size <= values.length; i += size) groups.push(values.slice(i, i + size));
    if (groups.length === 0) throw new RangeError(`${values.length} values do not fill one subgroup of ${size}`);
    sigmaWithin = sigmaFromSubgroupRanges(groups);
  }
  return capabilityFromSummary(
    { n: values.length, mean: mean(values), sigmaWithin, sigmaOverall: sampleStdDev(values) },
    limits,
    options.confidence ?? 0.95,
  );
}
