import { requireFinite, requireFiniteArray } from '../measure/guards';

/**
 * Histogram bins for a capability or characterization view.
 *
 * Bin-width rules:
 * - Freedman–Diaconis (D. Freedman & P. Diaconis, Z. Wahrscheinlichkeitstheorie verw. Gebiete 57:453–476, 1981):
 *   width h = 2·IQR·n^(−1/3), robust to outliers; the default;
 * - Sturges (H. A. Sturges, JASA 21:65–66, 1926): k = ⌈log₂ n⌉ + 1 bins, for small samples.
 * The quartiles are the linear-interpolation sample quantiles (Hyndman & Fan 1996, definition 7, the default of
 * R and NumPy). As NumPy's histogram_bin_edges does, the number of bins is ⌈range/h⌉ and the edges split the range
 * evenly. The range is widened to include any `include` values (spec and guarded limits), so those lines fall
 * on the chart. Bins are half-open [left, right) except the last, which is closed.
 */

export type BinRule = 'freedman-diaconis' | 'sturges';

export interface Histogram {
  /** k + 1 increasing edges, unit of the data */
  edges: number[];
  /** k counts; counts[i] covers edges[i] ≤ x < edges[i + 1] (last bin closed) */
  counts: number[];
  binWidth: number;
  /** the rule actually used (Freedman–Diaconis falls back to Sturges when the IQR is 0) */
  rule: BinRule;
}

/**
 * The values in ascending order, as a Float64Array: its built-in numeric sort is several times faster than
 * Array#sort with a comparator. Sort once and hand the result to every statistic that needs the order
 * (quartiles, histogram range, Anderson–Darling) instead of each sorting its own copy.
 */
export function sortedSample(values: readonly number[]): Float64Array {
  return Float64Array.from(values).sort();
}

/**
 * Sample quantile, linear interpolation between order statistics (Hyndman & Fan definition 7).
 * @param values at least one value
 * @param p probability 0..1
 */
export function quantile(values: readonly number[], p: number): number {
  requireFiniteArray('values', values, 1);
  return quantileOfSorted(sortedSample(values), p);
}

/** {@link quantile} of values already in ascending order (e.g. from {@link sortedSample}). */
export function quantileOfSorted(s: ArrayLike<number>, p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`quantile probability must lie between 0 and 1, got ${p}`);
  if (s.length < 1) throw new RangeError('values needs at least 1 value(s), got 0');
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, s.length - 1);
  return s[lo] + (h - lo) * (s[hi] - s[lo]);
}

/** Number of bins by Sturges' rule for n values: ⌈log₂ n⌉ + 1. */
export function sturgesBinCount(n: number): number {
  if (!(Number.isInteger(n) && n >= 1)) throw new RangeError(`n must be a whole number ≥ 1, got ${n}`);
  return Math.ceil(Math.log2(n)) + 1;
}

/** Freedman–Diaconis bin width 2·IQR·n^(−1/3), unit of the data (0 when the IQR is 0). */
export function freedmanDiaconisWidth(values: readonly number[]): number {
  requireFiniteArray('values', values, 1);
  return widthOfSorted(sortedSample(values));
}

function widthOfSorted(s: ArrayLike<number>): number {
  const iqr = quantileOfSorted(s, 0.75) - quantileOfSorted(s, 0.25);
  return (2 * iqr) / Math.cbrt(s.length);
}

/**
 * Bins and counts.
 * @param values measured values, at least 1
 * @param options rule (default Freedman–Diaconis), values the range must include (spec/guarded limits),
 *   maxBins cap (default 100) so an extreme outlier cannot produce a million empty bins, and `sorted`: the same
 *   values in ascending order when the caller has them already (from {@link sortedSample}; not checked again)
 */
export function histogram(
  values: readonly number[],
  options: { rule?: BinRule; include?: readonly number[]; maxBins?: number; sorted?: ArrayLike<number> } = {},
): Histogram {
  requireFiniteArray('values', values, 1);
  const sorted = options.sorted ?? sortedSample(values);
  if (sorted.length !== values.length) throw new RangeError(`sorted holds ${sorted.length} values, values ${values.length}`);
  const include = options.include ?? [];
  include.forEach((v, i) => requireFinite(`include[${i}]`, v));
  const maxBins = options.maxBins ?? 100;
  if (!(Number.isInteger(maxBins) && maxBins >= 1)) throw new RangeError(`maxBins must be a whole number ≥ 1, got ${maxBins}`);
  // the ends of the sorted values (no spread of a large array into Math.min: it has an argument limit)
  let lo = Math.min(sorted[0], ...include);
  let hi = Math.max(sorted[sorted.length - 1], ...include);
  if (lo === hi) {
    // one distinct value: a unit-wide bin around it, as NumPy does
    lo -= 0.5;
    hi += 0.5;
  }
  let rule: BinRule = options.rule ?? 'freedman-diaconis';
  let k: number;
  if (rule === 'freedman-diaconis') {
    const h = widthOfSorted(sorted);
    if (h > 0) k = Math.ceil((hi - lo) / h);
    else {
      rule = 'sturges';
      k = sturgesBinCount(values.length);
    }
  } else if (rule === 'sturges') k = sturgesBinCount(values.length);
  else throw new RangeError(`unknown bin rule "${String(rule)}"; use "freedman-diaconis" or "sturges"`);
  k = Math.min(Math.max(k, 1), maxBins);
  const width = (hi - lo) / k;
  const edges = Array.from({ length: k + 1 }, (_, i) => (i === k ? hi : lo + i * width));
  const counts = new Array<number>(k).fill(0);
  for (let i = 0; i < sorted.length; i++) {
    const v = sorted[i];
    let b = Math.floor((v - lo) / width);
    if (b >= k) b = k - 1;
    // floating-point edges: settle a value that lands beside its edge on the correct side
    if (b > 0 && v < edges[b]) b--;
    else if (b < k - 1 && v >= edges[b + 1]) b++;
    counts[b]++;
  }
  return { edges, counts, binWidth: width, rule };
}
