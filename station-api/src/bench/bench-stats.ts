/** Small statistics shared by the benchmark scripts (not product code). */

/** Nearest-rank quantile of a sorted sample (common practice, no source: the nearest-rank definition). */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[rank];
}

export interface Summary {
  n: number;
  median: number;
  mean: number;
  p95: number;
  p99: number;
}

export function summarize(xs: readonly number[]): Summary {
  const sorted = [...xs].sort((a, b) => a - b);
  const mean = sorted.reduce((a, b) => a + b, 0) / (sorted.length || 1);
  return { n: sorted.length, median: quantile(sorted, 0.5), mean, p95: quantile(sorted, 0.95), p99: quantile(sorted, 0.99) };
}

export const ms = (x: number, digits = 3): string => (Number.isFinite(x) ? x.toFixed(digits) : 'n/a');

/** One table row: label, then median, mean, p95, p99 in ms. */
export function summaryRow(label: string, s: Summary, width = 34): string {
  return `  ${label.padEnd(width)} ${ms(s.median).padStart(9)} ${ms(s.mean).padStart(9)} ${ms(s.p95).padStart(9)} ${ms(s.p99).padStart(9)}   (n=${s.n})`;
}
