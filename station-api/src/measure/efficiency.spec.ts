import { describe, expect, it } from 'vitest';
import { efficiencyPct, lossW } from './efficiency';

const REL = 1e-12;
const close = (actual: number, expected: number, rel = REL) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * rel);

describe('efficiencyPct', () => {
  it('follows η = Pout/Pin on the 12 V → 5 V, 2 A example', () => {
    // definition η = Pout/Pin (textbook definition, see docs/reference.md); self-constructed example, hand-checked:
    // 12 × 0.95 = 11.4 W in, 5 × 2 = 10 W out → 87.719 298 245 6 %
    close(efficiencyPct(12.0, 0.95, 5.0, 2.0), 87.7192982456, 1e-11);
  });

  it('follows η = Pout/Pin on the 5.02 V, 5 A example', () => {
    // self-constructed example, hand-checked: 12 × 2.237 = 26.844 W in, 5.02 × 5 = 25.1 W out → η = 0.935 032 036 954
    close(efficiencyPct(12.0, 2.237, 5.02, 5.0), 93.5032036954, 1e-11);
  });

  it('refuses a non-positive input power with a readable message', () => {
    expect(() => efficiencyPct(12, 0, 5, 1)).toThrow(RangeError);
    expect(() => efficiencyPct(12, 0, 5, 1)).toThrow(/input power is 0 W/);
    expect(() => efficiencyPct(-12, 1, 5, 1)).toThrow(/positive input power/);
  });

  it('refuses NaN readings', () => {
    expect(() => efficiencyPct(12, Number.NaN, 5, 1)).toThrow(/iinA must be a finite number/);
  });
});

describe('lossW', () => {
  it('is Pin − Pout on both worked examples', () => {
    // loss = Pin − Pout on the same self-constructed examples: 11.4 − 10 = 1.400 W, 26.844 − 25.1 = 1.744 W
    close(lossW(12.0, 0.95, 5.0, 2.0), 1.4, 1e-12);
    close(lossW(12.0, 2.237, 5.02, 5.0), 1.744, 1e-12);
  });

  it('refuses a non-positive input power', () => {
    expect(() => lossW(0, 1, 5, 1)).toThrow(RangeError);
  });
});
