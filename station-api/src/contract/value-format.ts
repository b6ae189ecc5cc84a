/*
 * How a measured value and its limits are written, everywhere: the station screen, the runs and repair
 * screens and the printed repair tag read this one module (the UI through its `@contract/*` alias).
 * Pure TypeScript: no imports, so both the server and the browser bundle can use it.
 */

/** Yes/no results (protection steps) travel as 1/0 with this unit. */
export const FLAG_UNIT = 'flag';

/** Most decimals ever shown; past this the instruments resolve nothing. */
const MAX_DIGITS = 6;

/**
 * The usual decimals of a quantity: V and A with three, mV/mA/µs with one, efficiency with one, other
 * percentages (regulation, near 0.1 %) with two. Common practice, no source: it matches the resolution of
 * a bench DMM in the ranges these modules use.
 */
export function baseDigits(quantity: string, unit: string): number {
  const base = quantity.split('@')[0] ?? quantity;
  if (base.startsWith('efficiency')) return 1;
  if (unit === '%') return 2;
  if (unit === 'V' || unit === 'A') return 3;
  if (unit === 'mV' || unit === 'mA' || unit === 'µs' || unit === 'us') return 1;
  return 2;
}

const finite = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** Decimals needed to write `x` exactly (limits are stated by people, guarded ones computed), at most 6. */
export function exactDigits(x: number): number {
  for (let d = 0; d < MAX_DIGITS; d++) {
    if (Math.abs(Number(x.toFixed(d)) - x) <= 1e-9 * Math.max(1, Math.abs(x))) return d;
  }
  return MAX_DIGITS;
}

function sign(x: number): number {
  return x > 0 ? 1 : x < 0 ? -1 : 0;
}

/**
 * Decimals to show a value next to the limits it was judged against, so that the comparison a reader makes
 * on the printed figures agrees with the one the engine made on the numbers: at least the quantity's usual
 * digits; every limit written at the precision it was stated or computed; and one more digit, as often as
 * needed, where rounding would make a value below a limit look equal to it or above it.
 */
export function digitsToShow(quantity: string, unit: string, value: number | null | undefined, bounds: Array<number | null | undefined>): number {
  let d = baseDigits(quantity, unit);
  const limits = bounds.filter(finite);
  for (const b of limits) d = Math.max(d, exactDigits(b));
  if (finite(value)) {
    for (const b of limits) {
      while (d < MAX_DIGITS && sign(Number(value.toFixed(d)) - Number(b.toFixed(d))) !== sign(value - b)) d++;
    }
  }
  return Math.min(d, MAX_DIGITS);
}

/** Fixed decimals so streamed values keep their width; a dash for a value that is not there. */
export function formatFigure(value: number | null | undefined, digits = 3): string {
  if (!finite(value)) return '—';
  const text = value.toFixed(digits);
  // toFixed keeps "-0.000" for tiny negatives; show it as zero.
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/** A measured value as text and unit; a yes/no result is written as a word. */
export function formatValue(value: number | null | undefined, quantity: string, unit: string, digits?: number): { text: string; unit: string } {
  if (unit === FLAG_UNIT) {
    if (!finite(value)) return { text: '—', unit: '' };
    return { text: value >= 0.5 ? 'yes' : 'no', unit: '' };
  }
  const text = formatFigure(value, digits ?? baseDigits(quantity, unit));
  return { text, unit: text === '—' ? '' : unit };
}

/**
 * Limits as `low … high`; a one-sided limit as `≤ high` or `≥ low`. Both bounds are inclusive, as in the
 * plan files. Without `digits`, each bound is written at its own stated precision.
 */
export function formatLimits(low: number | null | undefined, high: number | null | undefined, quantity: string, unit: string, digits?: number): string {
  if (unit === FLAG_UNIT) {
    if (finite(low) && finite(high) && low === high) return low >= 0.5 ? 'must be yes' : 'must be no';
    return 'yes or no';
  }
  const d = digits ?? digitsToShow(quantity, unit, undefined, [low, high]);
  const u = unit ? ` ${unit}` : '';
  if (finite(low) && finite(high)) return `${formatFigure(low, d)} … ${formatFigure(high, d)}${u}`;
  if (finite(high)) return `≤ ${formatFigure(high, d)}${u}`;
  if (finite(low)) return `≥ ${formatFigure(low, d)}${u}`;
  return 'no limit';
}

/** A judged measurement's figures, as every view carries them. */
export interface MeasuredFigures {
  quantity: string;
  unit: string;
  value: number | null;
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
}

/** True when the guarded acceptance limits are narrower than the specification (so worth showing). */
export function guardDiffers(m: Pick<MeasuredFigures, 'lowLimit' | 'highLimit' | 'guardedLow' | 'guardedHigh'>): boolean {
  const differs = (a: number | null, b: number | null) => finite(b) && (!finite(a) || Math.abs(a - b) > 1e-12);
  return differs(m.lowLimit, m.guardedLow) || differs(m.highLimit, m.guardedHigh);
}

/**
 * One measurement written for people: the value, the specification and (where a guard band narrows it)
 * the acceptance limits, all with the same number of decimals from {@link digitsToShow}.
 */
export function formatMeasured(m: MeasuredFigures): { value: string; unit: string; spec: string; accept: string | null; digits: number } {
  const digits = digitsToShow(m.quantity, m.unit, m.value, [m.lowLimit, m.highLimit, m.guardedLow, m.guardedHigh]);
  const v = formatValue(m.value, m.quantity, m.unit, digits);
  return {
    value: v.text,
    unit: v.unit,
    spec: formatLimits(m.lowLimit, m.highLimit, m.quantity, m.unit, digits),
    accept: guardDiffers(m) ? formatLimits(m.guardedLow, m.guardedHigh, m.quantity, m.unit, digits) : null,
    digits,
  };
}
