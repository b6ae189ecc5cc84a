import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { renderApp } from '@/testing/render';
import { verdictLooks, verdicts, type Verdict } from '@/theme';
import { VerdictBadge } from './verdict-badge';

// Word, shape and colour per verdict, never colour alone: an operator with a colour-vision deficiency must read it too.
const expected: Record<Verdict, { word: string; shape: string; color: string; note?: string }> = {
  pass: { word: 'PASS', shape: 'circle-check', color: 'signalGreen' },
  fail: { word: 'FAIL', shape: 'square-cross', color: 'signalRed' },
  error: { word: 'ERROR', shape: 'triangle-exclamation', color: 'signalAmber' },
  aborted: { word: 'Stopped', shape: 'bar', color: 'slate' },
  guard_fail: { word: 'FAIL', shape: 'square-cross', color: 'signalRed', note: 'inside spec, outside guard band' },
};

describe('VerdictBadge', () => {
  it('covers every verdict the theme defines', () => {
    expect([...verdicts].sort()).toEqual(Object.keys(expected).sort());
  });

  it.each(Object.entries(expected) as [Verdict, (typeof expected)[Verdict]][])(
    '%s shows its word and its shape',
    (verdict, want) => {
      const { container } = renderApp(<VerdictBadge verdict={verdict} />);
      const badge = container.querySelector(`[data-verdict="${verdict}"]`) as HTMLElement;
      expect(badge).not.toBeNull();
      expect(screen.getByText(want.word)).toBeInTheDocument();
      expect(badge.querySelector('svg')).toHaveAttribute('data-shape', want.shape);
      expect(badge.style.getPropertyValue('--verdict-base')).toBe(`var(--mantine-color-${want.color}-6)`);
      if (want.note) expect(badge).toHaveTextContent(want.note);
      expect(verdictLooks[verdict].color).toBe(want.color);
    },
  );

  it('keeps the guard-band case apart from a plain fail', () => {
    renderApp(
      <>
        <VerdictBadge verdict="fail" />
        <VerdictBadge verdict="guard_fail" />
      </>,
    );
    expect(screen.getAllByText('FAIL')).toHaveLength(2);
    expect(screen.getAllByText('inside spec, outside guard band')).toHaveLength(1);
  });
});
