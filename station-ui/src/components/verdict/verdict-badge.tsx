import type { CSSProperties } from 'react';
import { verdictLooks, type Verdict } from '@/theme';
import classes from './verdict-badge.module.css';
import { VerdictShape } from './verdict-shape';

export type VerdictBadgeSize = 'sm' | 'md' | 'lg' | 'xl';

const shapePx: Record<VerdictBadgeSize, number> = { sm: 14, md: 16, lg: 22, xl: 44 };

export interface VerdictBadgeProps {
  verdict: Verdict;
  size?: VerdictBadgeSize;
  className?: string;
}

/** A verdict as word + shape + colour, never colour alone, so it reads without colour vision. */
export function VerdictBadge({ verdict, size = 'md', className }: VerdictBadgeProps) {
  const look = verdictLooks[verdict];
  return (
    <span
      title={look.description}
      data-verdict={verdict}
      className={[classes.badge, classes[size], className].filter(Boolean).join(' ')}
      style={
        {
          '--verdict-base': `var(--mantine-color-${look.color}-6)`,
          '--verdict-tint': `var(--mantine-color-${look.color}-0)`,
          '--verdict-ink': `var(--mantine-color-${look.color}-9)`,
          '--verdict-deep': `var(--mantine-color-${look.color}-8)`,
        } as CSSProperties
      }
    >
      <VerdictShape shape={look.shape} size={shapePx[size]} className={classes.shape} />
      <span className={classes.word}>{look.word}</span>
      {look.note && <span className={classes.note}>{look.note}</span>}
    </span>
  );
}
