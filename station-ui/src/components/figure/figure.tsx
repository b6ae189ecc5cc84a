import type { CSSProperties } from 'react';
import classes from './figure.module.css';

export interface FigureProps {
  /** The number to show; null, undefined or NaN shows a dash (not measured yet) */
  value: number | null | undefined;
  /** Unit written after the number: V, A, mA, mV, %, µs … (empty for a bare count) */
  unit?: string;
  /** Digits after the decimal point (V with 3, % with 1, mV with 1: enough to compare with the limits, no noise digits) */
  digits?: number;
  /** Font size in px or any CSS length */
  size?: number | string;
  className?: string;
  style?: CSSProperties;
}

/** Formats with a fixed number of decimals so streamed values keep their width. */
export function formatFigure(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = value.toFixed(digits);
  // toFixed keeps "-0.000" for tiny negatives; show it as zero.
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/**
 * A measured number with its unit, in JetBrains Mono with tabular digits so columns line up and a
 * value does not shift while it updates.
 */
export function Figure({ value, unit, digits = 3, size, className, style }: FigureProps) {
  const text = formatFigure(value, digits);
  const missing = text === '—';
  return (
    <span
      className={[classes.figure, missing ? classes.missing : undefined, className].filter(Boolean).join(' ')}
      style={size !== undefined ? { fontSize: size, ...style } : style}
      data-figure
    >
      {text}
      {unit && !missing && <span className={classes.unit}>{unit}</span>}
    </span>
  );
}
