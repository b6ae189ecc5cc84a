import type { ProportionInterval } from '../api/yield-filters';

/** A 0..1 proportion as percent with one decimal ("92.4"), or a dash when there is nothing to estimate. */
export function pctText(p: number | null | undefined): string {
  return p === null || p === undefined || !Number.isFinite(p) ? '—' : (100 * p).toFixed(1);
}

/** "23.1 – 88.2 %" */
export function intervalText(i: Pick<ProportionInterval, 'lower' | 'upper' | 'n'>): string {
  if (i.n === 0) return 'no units';
  return `${pctText(i.lower)} – ${pctText(i.upper)} %`;
}

/** A capability index or other unitless figure with two decimals. */
export function indexText(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(2);
}

/** Expected parts per million: whole numbers from 10 up, one decimal below, so small tails stay visible. */
export function ppmText(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (v > 0 && v < 0.1) return '< 0.1';
  return v >= 10 ? Math.round(v).toLocaleString('en-GB') : v.toFixed(1);
}
