import type { ReactNode } from 'react';

interface DrawnShapeProps {
  /** Name of the drawing, written to `data-shape` so tests and styles can tell shapes apart */
  shape: string;
  /** Edge length in px */
  size: number;
  className?: string;
  /** The strokes, on a 24 × 24 grid */
  children: ReactNode;
}

/**
 * The common frame of the verdict and station-state shapes: a 24-unit grid drawn in the text colour
 * with one stroke weight, so every shape looks alike at any size. Hidden from screen readers: the word
 * beside a shape carries its meaning.
 */
export function DrawnShape({ shape, size, className, children }: DrawnShapeProps) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 24 24"
      aria-hidden="true"
      focusable="false"
      data-shape={shape}
      className={className}
      fill="none"
      stroke="currentColor"
      strokeWidth={2.4}
      strokeLinecap="round"
      strokeLinejoin="round"
    >
      {children}
    </svg>
  );
}
