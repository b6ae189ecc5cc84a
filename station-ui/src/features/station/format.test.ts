import { describe, expect, it } from 'vitest';
import { digitsFor, formatClock, formatDuration, formatLimits, formatValue, guardDiffers } from './format';

describe('station formatting', () => {
  it('gives each quantity the decimals of ui-design.md', () => {
    expect(digitsFor('voutV@1.5', 'V')).toBe(3);
    expect(digitsFor('efficiencyPct@3', '%')).toBe(1);
    expect(digitsFor('loadRegPct', '%')).toBe(2);
    expect(digitsFor('rippleMvPp', 'mV')).toBe(1);
  });

  it('writes limits as "low … high", one-sided limits with ≤ / ≥', () => {
    expect(formatLimits(4.9, 5.1, 'voutV', 'V')).toBe('4.900 … 5.100 V');
    expect(formatLimits(null, 15, 'iinNoLoadMa', 'mA')).toBe('≤ 15.0 mA');
    expect(formatLimits(93, undefined, 'efficiencyPct@1.5', '%')).toBe('≥ 93.0 %');
    expect(formatLimits(1, 1, 'foldback', 'flag')).toBe('must be yes');
  });

  it('writes yes/no results as words', () => {
    expect(formatValue(1, 'foldback', 'flag')).toEqual({ text: 'yes', unit: '' });
    expect(formatValue(0, 'recovered', 'flag')).toEqual({ text: 'no', unit: '' });
    expect(formatValue(null, 'voutV', 'V')).toEqual({ text: '—', unit: '' });
    expect(formatValue(4.98765, 'voutV', 'V')).toEqual({ text: '4.988', unit: 'V' });
  });

  it('shows the guard band only when it is narrower than the spec', () => {
    expect(guardDiffers(4.9, 5.1, 4.91, 5.09)).toBe(true);
    expect(guardDiffers(4.9, 5.1, 4.9, 5.1)).toBe(false);
    expect(guardDiffers(null, 15, null, null)).toBe(false);
  });

  it('formats times', () => {
    expect(formatDuration(8_440)).toBe('8.4 s');
    expect(formatDuration(65_000)).toBe('1:05');
    expect(formatClock(5_999)).toBe('0:05');
    expect(formatClock(125_000)).toBe('2:05');
  });
});
