/*
 * Times on the station screen. Values and limits are written by the shared formatter only
 * (`@contract/value-format`: formatMeasured, formatValue, formatLimits).
 */

/** A run time as "8.4 s" under a minute, "1:05" (min:s) above. */
export function formatDuration(ms: number): string {
  if (!Number.isFinite(ms) || ms < 0) return '—';
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  const s = Math.floor(ms / 1000);
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}

/** Elapsed time on the running clock: always "m:ss", so it keeps its width. */
export function formatClock(ms: number): string {
  const s = Math.max(0, Math.floor(ms / 1000));
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}
