import { describe, expect, it } from 'vitest';
import { digitsToShow, exactDigits, formatFigure, formatLimits, formatMeasured, formatValue } from './value-format';

describe('value format', () => {
  it('writes the usual decimals per unit', () => {
    expect(formatValue(4.9876, 'voutV', 'V').text).toBe('4.988');
    expect(formatValue(87.71929824, 'efficiencyPct@1.5', '%').text).toBe('87.7');
    expect(formatValue(12.345, 'rippleMvPp', 'mV').text).toBe('12.3');
    expect(formatValue(1, 'foldback', 'flag').text).toBe('yes');
    expect(formatFigure(-0.0001, 3)).toBe('0.000');
    expect(formatFigure(null)).toBe('—');
  });

  it('adds a digit where rounding would hide a failure (92.96 % against ≥ 93.0 %)', () => {
    // self-constructed example: 92.96 rounds to 93.0 at one decimal, which would read as inside the limit
    const m = formatMeasured({ quantity: 'efficiencyPct@1.5', unit: '%', value: 92.96, lowLimit: 93, highLimit: null, guardedLow: 93, guardedHigh: null });
    expect(m.value).toBe('92.96');
    expect(m.spec).toBe('≥ 93.00 %');
    expect(digitsToShow('voutV', 'V', 3.29996, [3.3])).toBe(5);
  });

  it('writes guarded limits at the precision they were computed (3.2255 … 3.3745 V)', () => {
    // self-constructed example: spec 3.217 … 3.383 V narrowed by U = 0.0085 V on each side
    expect(exactDigits(3.2255)).toBe(4);
    const m = formatMeasured({ quantity: 'voutV', unit: 'V', value: 3.3, lowLimit: 3.217, highLimit: 3.383, guardedLow: 3.2255, guardedHigh: 3.3745 });
    expect(m.accept).toBe('3.2255 … 3.3745 V');
    expect(m.spec).toBe('3.2170 … 3.3830 V');
    expect(m.value).toBe('3.3000');
  });

  it('writes one-sided and flag limits in words', () => {
    expect(formatLimits(null, 30, 'rippleMvPp', 'mV')).toBe('≤ 30.0 mV');
    expect(formatLimits(1, 1, 'foldback', 'flag')).toBe('must be yes');
    expect(formatLimits(null, null, 'x', 'V')).toBe('no limit');
  });
});
