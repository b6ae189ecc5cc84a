import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { renderApp } from '@/testing/render';
import { Figure, formatFigure } from './figure';

describe('Figure', () => {
  it('formats with fixed decimals so streamed values keep their width', () => {
    expect(formatFigure(4.9876, 3)).toBe('4.988');
    expect(formatFigure(5, 3)).toBe('5.000');
    expect(formatFigure(87.71929824, 1)).toBe('87.7');
    expect(formatFigure(-0.0001, 3)).toBe('0.000');
    expect(formatFigure(-1.25, 2)).toBe('-1.25');
  });

  it('shows a dash for a value that is not there', () => {
    expect(formatFigure(null)).toBe('—');
    expect(formatFigure(undefined)).toBe('—');
    expect(formatFigure(Number.NaN)).toBe('—');
    expect(formatFigure(Number.POSITIVE_INFINITY)).toBe('—');
  });

  it('renders number and unit', () => {
    renderApp(<Figure value={12.5} unit="mV" digits={1} />);
    const fig = screen.getByText('12.5', { exact: false });
    expect(fig).toHaveTextContent('12.5mV');
    expect(fig).toHaveAttribute('data-figure');
  });
});
