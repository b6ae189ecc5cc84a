import type { StationState } from '@station-events';
import type { CSSProperties } from 'react';
import { DrawnShape } from '@/components/drawn-shape';
import classes from './station-state-mark.module.css';
import { stationStateLooks, type StationStateShape } from './station-state-look';

interface ShapeProps {
  shape: StationStateShape;
  size: number;
}

/** The station-state shapes, drawn here so they stay identical at every size. */
export function StationStateShapeIcon({ shape, size }: ShapeProps) {
  return (
    <DrawnShape shape={shape} size={size}>
      {shape === 'ring-dot' && (
        <>
          <circle cx="12" cy="12" r="10" />
          <circle cx="12" cy="12" r="4" fill="currentColor" stroke="none" />
        </>
      )}
      {shape === 'play' && <path d="M7 4.5v15l12-7.5z" fill="currentColor" />}
      {shape === 'triangle-exclamation' && (
        <>
          <path d="M12 2.8L22 20.5H2z" />
          <path d="M12 9.5v5" />
          <path d="M12 17.6v0.2" />
        </>
      )}
      {shape === 'no-entry' && (
        <>
          <circle cx="12" cy="12" r="10" />
          <path d="M6.5 12h11" strokeWidth={3.2} />
        </>
      )}
      {shape === 'ring' && <circle cx="12" cy="12" r="9" />}
    </DrawnShape>
  );
}

export interface StationStateMarkProps {
  state: StationState;
  /** Font size of the word in px; the shape follows it */
  sizePx?: number;
  /** Solid background (wall board) instead of the tinted one */
  solid?: boolean;
  className?: string;
}

/** A station's state as word + shape + colour. */
export function StationStateMark({ state, sizePx = 16, solid = false, className }: StationStateMarkProps) {
  const look = stationStateLooks[state];
  return (
    <span
      className={[classes.mark, solid ? classes.solid : undefined, className].filter(Boolean).join(' ')}
      data-station-state={state}
      title={look.description}
      style={
        {
          fontSize: sizePx,
          '--state-base': `var(--mantine-color-${look.color}-6)`,
          '--state-tint': `var(--mantine-color-${look.color}-0)`,
          '--state-ink': `var(--mantine-color-${look.color}-9)`,
          '--state-deep': `var(--mantine-color-${look.color}-8)`,
        } as CSSProperties
      }
    >
      <StationStateShapeIcon shape={look.shape} size={Math.round(sizePx * 1.15)} />
      <span className={classes.word}>{look.word}</span>
    </span>
  );
}
