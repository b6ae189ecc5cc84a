import { digitsToShow } from '@contract/value-format';
import type { DataSetColumn, FileProblem } from '../api/types';

/** A capability index with two decimals, or a dash. */
export function indexText(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(2);
}

/** Expected parts per million: whole numbers from 10 up, one decimal below, "< 0.1" for a tail too small to show. */
export function ppmText(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (v > 0 && v < 0.1) return '< 0.1';
  return v >= 10 ? Math.round(v).toLocaleString('en-GB') : v.toFixed(1);
}

/** A p-value as people read it: three decimals, "< 0.001" below that. */
export function pValueText(p: number): string {
  return p < 0.001 ? '< 0.001' : p.toFixed(3);
}

/** Decimals for the values of a column next to the given limits (the shared value formatter's rule). */
export function columnDigits(column: DataSetColumn, bounds: Array<number | null | undefined>): number {
  return digitsToShow(column.name, column.unit, undefined, bounds);
}

/** "line 4, column vout_V: …" for one problem of a refused file. */
export function problemText(p: FileProblem): string {
  const where = [p.line > 0 ? `Line ${p.line}` : '', p.column ? `column ${p.column}` : ''].filter(Boolean).join(', ');
  return where ? `${where}: ${p.message}` : p.message.charAt(0).toUpperCase() + p.message.slice(1);
}

/** A number typed into an input, or undefined when the field is empty or not a number. */
export function numberOrUndefined(v: string | number): number | undefined {
  if (typeof v === 'number') return Number.isFinite(v) ? v : undefined;
  if (v.trim() === '') return undefined;
  const n = Number(v);
  return Number.isFinite(n) ? n : undefined;
}
