import {
  andersonDarling,
  capability,
  histogram,
  mean,
  MIN_AD_SAMPLE,
  ppmOutside,
  proposeLimits,
  sampleStdDev,
  shapiroWilk,
  sigmaFromMovingRange,
  type CapabilityReport,
  type Histogram,
  type LimitProposal,
  type PpmOutside,
} from '../stats';
import { DEFAULT_SUGGESTION_K } from '../contract/limit-suggestion';

/*
 * The figures of one quantity of a characterization data set: a composition of src/stats (no statistics of its
 * own). Values are taken in file order, which the file format asks to be the build order: the moving-range σ
 * (within, for Cp/Cpk) compares neighbours, the overall σ (Pp/Ppk) does not care about order.
 */

export { DEFAULT_SUGGESTION_K };
/** Fewest values capability figures are given for (the stats functions need 2; fewer than 8 say nothing useful, common practice, no source). */
export const MIN_CAPABILITY_VALUES = 8;
/** p-value below which a normality test is read as evidence against normality (common practice, no source). */
export const NORMALITY_ALPHA = 0.05;

export interface NormalityTestView {
  test: 'Anderson–Darling' | 'Shapiro–Wilk';
  statistic: number;
  pValue: number;
  method: string;
}

export interface CharacterizationAnalysis {
  n: number;
  /** units in the data set without a value for this quantity */
  missing: number;
  mean: number | null;
  /** sample standard deviation s (n − 1): the overall σ */
  sd: number | null;
  /** moving-range σ (MR̄/d2), the within σ of Cp/Cpk */
  sigmaWithin: number | null;
  min: number | null;
  max: number | null;
  histogram: Histogram | null;
  normality: {
    andersonDarling: NormalityTestView | null;
    shapiroWilk: NormalityTestView | null;
    /** the test the screen leads with: Anderson–Darling when it applies (n ≥ 8), else Shapiro–Wilk */
    primary: NormalityTestView | null;
    /** the result in plain words */
    reading: string;
  };
  /** the limits the figures are computed against (proposed by the engineer), if any */
  limits: { low: number | null; high: number | null };
  capability: CapabilityReport | null;
  /** expected ppm outside the proposed limits, normal model N(x̄, s) (the Ppk view) */
  ppmOutside: PpmOutside | null;
  suggestion: (LimitProposal & { k: number; uncertainty: number }) | null;
  /** why a figure is missing, in plain words */
  problems: string[];
}

export interface AnalysisOptions {
  low?: number;
  high?: number;
  /** multiplier for the suggested limits; default 4 */
  k?: number;
  /** expanded measurement uncertainty U (k = 2) the suggestion guards by; default 0 */
  uncertainty?: number;
}

function view(test: NormalityTestView['test'], r: { statistic: number; pValue: number; method: string }): NormalityTestView {
  return { test, statistic: r.statistic, pValue: r.pValue, method: r.method };
}

/** Plain reading of a normality p-value. */
export function normalityReading(t: NormalityTestView | null): string {
  if (!t) return 'Too few values for a normality test.';
  if (t.pValue < NORMALITY_ALPHA) {
    return `The values do not look normal (${t.test} p < ${NORMALITY_ALPHA}): expected ppm and capability intervals assume normality, read them with care.`;
  }
  return `No evidence against normality (${t.test} p ≥ ${NORMALITY_ALPHA}); this does not prove the values are normal.`;
}

/**
 * Figures of one quantity.
 * @param raw values in build order, null where a unit was not measured
 * @param options proposed limits (one-sided allowed) and the suggestion's k and uncertainty, unit of the values
 * @throws RangeError when the proposed low is not below the proposed high
 */
export function analyseQuantity(raw: readonly (number | null)[], options: AnalysisOptions = {}): CharacterizationAnalysis {
  const { low, high } = options;
  if (low !== undefined && high !== undefined && !(low < high)) throw new RangeError(`the proposed low ${low} must be below the proposed high ${high}`);
  const values = raw.filter((v): v is number => v !== null);
  const n = values.length;
  const problems: string[] = [];
  const m = n >= 1 ? mean(values) : null;
  const sd = n >= 2 ? sampleStdDev(values) : null;
  const sigmaWithin = n >= 2 ? sigmaFromMovingRange(values) : null;
  const varies = sd !== null && sd > 0;
  if (n >= 1 && !varies) problems.push(n < 2 ? 'Only one value: no spread, so no σ, normality test or capability.' : 'All values are equal: no spread, so no normality test or capability.');

  const ad = varies && n >= MIN_AD_SAMPLE ? view('Anderson–Darling', andersonDarling(values)) : null;
  const sw = varies && n >= 3 && n <= 5000 ? view('Shapiro–Wilk', shapiroWilk(values)) : null;
  const primary = ad ?? sw;

  const include = [low, high].filter((x): x is number => x !== undefined);
  const hist = n >= 1 ? histogram(values, { include }) : null;

  const hasLimits = low !== undefined || high !== undefined;
  let cap: CapabilityReport | null = null;
  let ppm: PpmOutside | null = null;
  if (hasLimits && varies) {
    if (n < MIN_CAPABILITY_VALUES) problems.push(`Capability needs at least ${MIN_CAPABILITY_VALUES} values; this quantity has ${n}.`);
    else if (!(sigmaWithin! > 0)) problems.push('Neighbouring values are all equal, so the moving-range σ is 0 and Cp/Cpk are undefined.');
    else cap = capability(values, { lsl: low, usl: high });
    ppm = ppmOutside(m!, sd!, { lsl: low, usl: high });
  } else if (!hasLimits) {
    problems.push('Propose a low limit, a high limit or both to see Cpk, Ppk and the expected ppm outside them.');
  }

  const k = options.k ?? DEFAULT_SUGGESTION_K;
  const uncertainty = options.uncertainty ?? 0;
  let suggestion: CharacterizationAnalysis['suggestion'] = null;
  if (varies) {
    try {
      suggestion = { ...proposeLimits({ mean: m!, sigma: sd!, k, uncertainty }), k, uncertainty };
    } catch (e) {
      problems.push(`No suggested limits: ${(e as Error).message}.`);
    }
  }

  return {
    n,
    missing: raw.length - n,
    mean: m,
    sd,
    sigmaWithin,
    min: n >= 1 ? Math.min(...values) : null,
    max: n >= 1 ? Math.max(...values) : null,
    histogram: hist,
    normality: { andersonDarling: ad, shapiroWilk: sw, primary, reading: normalityReading(primary) },
    limits: { low: low ?? null, high: high ?? null },
    capability: cap,
    ppmOutside: ppm,
    suggestion,
    problems,
  };
}
