import { DrawnShape } from '@/components/drawn-shape';
import type { VerdictShape as Shape } from '@/theme';

interface VerdictShapeProps {
  shape: Shape;
  /** Edge length in px */
  size: number;
  className?: string;
}

/**
 * The shape that goes with each verdict, drawn here so it stays identical at 16 px and at 120 px and
 * needs no icon set. The word beside it carries the meaning for screen readers, so the drawing is hidden.
 */
export function VerdictShape({ shape, size, className }: VerdictShapeProps) {
  return (
    <DrawnShape shape={shape} size={size} className={className}>
      {shape === 'circle-check' && (
        <>
          <circle cx="12" cy="12" r="10" />
          <path d="M7.5 12.5l3 3 6-7" />
        </>
      )}
      {shape === 'square-cross' && (
        <>
          <rect x="2.5" y="2.5" width="19" height="19" rx="1.5" />
          <path d="M8 8l8 8M16 8l-8 8" />
        </>
      )}
      {shape === 'triangle-exclamation' && (
        <>
          <path d="M12 2.8L22 20.5H2z" />
          <path d="M12 9.5v5" />
          <path d="M12 17.6v0.2" />
        </>
      )}
      {shape === 'bar' && <path d="M4 12h16" strokeWidth={4} />}
    </DrawnShape>
  );
}
