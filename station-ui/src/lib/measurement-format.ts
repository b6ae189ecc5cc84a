import { formatFigure } from '@/components/figure';

/*
 * How measured values and their limits are written on every screen (V with three decimals, % with one for
 * efficiency, mV with one: enough digits to judge a value against its limits, no digits that only show noise).
 * Shared by the operator station and the runs screens.
 */

/** Yes/no results (protection steps) travel as 1/0 with this unit (station-api plan-quantities.ts). */
export const FLAG_UNIT = 'flag';

/**
 * Decimals per quantity (V with three, % with one for efficiency, mV with one). Regulation
 * figures sit near 0.1 %, so they get two decimals to stay readable against limits like 0.5 %.
 */
export function digitsFor(quantity: string, unit: string): number {
  const base = quantity.split('@')[0] ?? quantity;
  if (base.startsWith('efficiency')) return 1;
  if (unit === '%') return 2;
  if (unit === 'V' || unit === 'A') return 3;
  if (unit === 'mV' || unit === 'mA' || unit === 'µs' || unit === 'us') return 1;
  return 2;
}

/** A measured value as text and unit; a yes/no result is written as a word. */
export function formatValue(value: number | null | undefined, quantity: string, unit: string): { text: string; unit: string } {
  if (unit === FLAG_UNIT) {
    if (value === null || value === undefined || !Number.isFinite(value)) return { text: '—', unit: '' };
    return { text: value >= 0.5 ? 'yes' : 'no', unit: '' };
  }
  const text = formatFigure(value, digitsFor(quantity, unit));
  return { text, unit: text === '—' ? '' : unit };
}

/**
 * Limits as `low … high`, written next to the value so the two can be compared at a glance; a one-sided
 * limit as `≤ high` or `≥ low`. Both bounds are inclusive, as in the plan files.
 */
export function formatLimits(low: number | null | undefined, high: number | null | undefined, quantity: string, unit: string): string {
  const has = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);
  if (unit === FLAG_UNIT) {
    if (has(low) && has(high) && low === high) return low >= 0.5 ? 'must be yes' : 'must be no';
    return 'yes or no';
  }
  const d = digitsFor(quantity, unit);
  const u = unit ? ` ${unit}` : '';
  if (has(low) && has(high)) return `${formatFigure(low, d)} … ${formatFigure(high, d)}${u}`;
  if (has(high)) return `≤ ${formatFigure(high, d)}${u}`;
  if (has(low)) return `≥ ${formatFigure(low, d)}${u}`;
  return 'no limit';
}

/** True when the guarded acceptance limits are narrower than the specification (so worth showing). */
export function guardDiffers(
  low: number | null | undefined,
  high: number | null | undefined,
  guardedLow: number | null | undefined,
  guardedHigh: number | null | undefined,
): boolean {
  const differs = (a: number | null | undefined, b: number | null | undefined) =>
    typeof b === 'number' && Number.isFinite(b) && (typeof a !== 'number' || Math.abs(a - b) > 1e-12);
  return differs(low, guardedLow) || differs(high, guardedHigh);
}
