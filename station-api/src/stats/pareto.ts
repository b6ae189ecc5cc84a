/**
 * Pareto table of failure causes (by step, failing quantity or repair cause): categories sorted by count,
 * largest first, with the running total as a percentage of all counts (J. M. Juran's Pareto principle; the
 * chart is described in the NIST/SEMATECH e-Handbook and in Montgomery, Introduction to Statistical Quality
 * Control, ch. 5). Ties keep alphabetical order so the table is stable between refreshes.
 */

export interface ParetoInput {
  /** category label, e.g. a step name or a cause */
  key: string;
  /** occurrences, a whole number ≥ 0 */
  count: number;
}

export interface ParetoRow {
  key: string;
  count: number;
  /** this category's share of the total, percent */
  percent: number;
  /** running total up to and including this row */
  cumulativeCount: number;
  /** running total as a percentage of the total; the last row is exactly 100 */
  cumulativePercent: number;
}

/**
 * @param items categories with counts; a key may appear more than once (its counts are added)
 * @returns rows sorted descending; categories with count 0 are kept at the end; an empty input gives []
 * @throws RangeError on a negative or fractional count or an empty key
 */
export function paretoTable(items: readonly ParetoInput[]): ParetoRow[] {
  if (!Array.isArray(items)) throw new RangeError('pareto input must be an array of { key, count }');
  const totals = new Map<string, number>();
  items.forEach((it, i) => {
    if (typeof it?.key !== 'string' || it.key === '') throw new RangeError(`item ${i + 1} has no category label`);
    if (!(Number.isInteger(it.count) && it.count >= 0)) {
      throw new RangeError(`item ${i + 1} ("${it.key}") has count ${String(it.count)}; counts are whole numbers, 0 or more`);
    }
    totals.set(it.key, (totals.get(it.key) ?? 0) + it.count);
  });
  const sorted = [...totals.entries()].sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0));
  const total = sorted.reduce((a, [, c]) => a + c, 0);
  let running = 0;
  return sorted.map(([key, count], i) => {
    running += count;
    const last = i === sorted.length - 1;
    return {
      key,
      count,
      percent: total === 0 ? 0 : (100 * count) / total,
      cumulativeCount: running,
      // the last row is set to 100 exactly (when there is anything to count) so rounding never shows 99.99 %
      cumulativePercent: total === 0 ? 0 : last ? 100 : (100 * running) / total,
    };
  });
}
