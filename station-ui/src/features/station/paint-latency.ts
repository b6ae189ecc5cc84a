declare global {
  interface Window {
    /**
     * Server emit → paint delays of judged values, in ms (docs/performance.md, "Operator screen"). Read by
     * the browser test; the newest {@link MAX_SAMPLES} are kept.
     */
    __railwrightPaintLatencyMs?: number[];
  }
}

const MAX_SAMPLES = 2_000;

/**
 * Records how long a judged value took from the server's `emit` to the frame that shows it. Called from
 * the row's layout effect (the React commit is done); the next animation frame callback runs just before
 * that frame is painted, and `performance.timeOrigin + performance.now()` puts it on the same epoch clock
 * as the server's `emittedAt` (valid when both run on one machine, or on NTP-synchronised clocks).
 */
export function recordPaintLatency(emittedAtMs: number): void {
  if (typeof window.requestAnimationFrame !== 'function' || !Number.isFinite(emittedAtMs)) return;
  window.requestAnimationFrame(() => {
    const paintedAtMs = performance.timeOrigin + performance.now();
    const samples = (window.__railwrightPaintLatencyMs ??= []);
    samples.push(paintedAtMs - emittedAtMs);
    if (samples.length > MAX_SAMPLES) samples.splice(0, samples.length - MAX_SAMPLES);
  });
}

/**
 * Sample quantile by linear interpolation between order statistics: definition 7 of Hyndman & Fan (1996),
 * the default of R's `quantile()` and NumPy's `percentile()` (recalled from memory; the tests check it
 * against d3-array's `quantile()`).
 * @param sorted values in ascending order (ms)
 * @param p probability, 0…1
 */
export function quantileR7(sorted: readonly number[], p: number): number {
  if (sorted.length === 0 || !(p >= 0 && p <= 1)) return Number.NaN;
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

export interface LatencySummary {
  count: number;
  medianMs: number;
  p95Ms: number;
  minMs: number;
  maxMs: number;
}

/** Median, 95th percentile and range of emit → paint delays (ms). */
export function summariseLatencies(samplesMs: readonly number[]): LatencySummary {
  const sorted = samplesMs.filter((v) => Number.isFinite(v)).sort((a, b) => a - b);
  return {
    count: sorted.length,
    medianMs: quantileR7(sorted, 0.5),
    p95Ms: quantileR7(sorted, 0.95),
    minMs: sorted[0] ?? Number.NaN,
    maxMs: sorted[sorted.length - 1] ?? Number.NaN,
  };
}
