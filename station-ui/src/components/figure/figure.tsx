import { formatFigure } from '@contract/value-format';
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

/** Fixed decimals so streamed values keep their width: the contract's one formatter, not a copy. */
export { formatFigure };

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
