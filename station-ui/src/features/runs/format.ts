import { formatFigure } from '@/components/figure';

/*
 * Number formatting for stored runs. The same rules as the operator screen (ui-design.md: V with three
 * decimals, % with one for efficiency, mV with one); kept here because features do not import each other.
 */

/** Yes/no results (protection steps) travel as 1/0 with this unit (station-api plan-quantities.ts). */
export const FLAG_UNIT = 'flag';

/** Decimals per quantity; regulation sits near 0.1 %, so % gets two unless it is an efficiency. */
export function digitsFor(quantity: string, unit: string): number {
  const base = quantity.split('@')[0] ?? quantity;
  if (base.startsWith('efficiency')) return 1;
  if (unit === '%') return 2;
  if (unit === 'V' || unit === 'A') return 3;
  if (unit === 'mV' || unit === 'mA' || unit === 'µs' || unit === 'us') return 1;
  return 2;
}

const has = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** A stored value as text and unit; a yes/no result as a word. */
export function formatValue(value: number | null | undefined, quantity: string, unit: string): { text: string; unit: string } {
  if (unit === FLAG_UNIT) return { text: has(value) ? (value >= 0.5 ? 'yes' : 'no') : '—', unit: '' };
  const text = formatFigure(value, digitsFor(quantity, unit));
  return { text, unit: text === '—' ? '' : unit };
}

/** Limits as `low … high`; one-sided as `≤ high` / `≥ low`. Both bounds inclusive, as in the plan files. */
export function formatLimits(low: number | null | undefined, high: number | null | undefined, quantity: string, unit: string): string {
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

/** True when the guarded acceptance limits are narrower than the specification, so worth showing. */
export function guardDiffers(
  low: number | null | undefined,
  high: number | null | undefined,
  guardedLow: number | null | undefined,
  guardedHigh: number | null | undefined,
): boolean {
  const differs = (a: number | null | undefined, b: number | null | undefined) => has(b) && (!has(a) || Math.abs(a - b) > 1e-12);
  return differs(low, guardedLow) || differs(high, guardedHigh);
}

/** Run length as "8.4 s" under a minute, "1:05" (min:s) above; a dash while still running. */
export function formatDuration(ms: number | null | undefined): string {
  if (!has(ms) || ms < 0) return '—';
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  const s = Math.floor(ms / 1000);
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}

const p2 = (n: number) => String(n).padStart(2, '0');

/** Local time as yyyy-mm-dd hh:mm:ss: sortable by eye, the same width on every row. */
export function formatStamp(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())} ${p2(d.getHours())}:${p2(d.getMinutes())}:${p2(d.getSeconds())}`;
}

/** Local time of day as hh:mm:ss (the day is in the run's header). */
export function formatTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${p2(d.getHours())}:${p2(d.getMinutes())}:${p2(d.getSeconds())}`;
}

/** Local calendar day as yyyy-mm-dd. */
export function formatDay(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())}`;
}

/** Local midnight at the start of a `yyyy-mm-dd` day as ISO 8601, or undefined for anything else. */
export function dayStartIso(day: string | null | undefined, addDays = 0): string | undefined {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day ?? '');
  if (!m) return undefined;
  const d = new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]) + addDays);
  return Number.isNaN(d.getTime()) ? undefined : d.toISOString();
}
