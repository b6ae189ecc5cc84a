import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { summarizeQuantities, type QuantityValue } from './certificate-content';

const v = (value: number, over: Partial<QuantityValue> = {}): QuantityValue => ({
  stepKey: 'vout',
  stepName: 'Output voltage',
  quantity: 'voutV',
  name: 'Output voltage',
  unit: 'V',
  value,
  lowLimit: 4.9,
  highLimit: 5.1,
  ...over,
});

describe('summarizeQuantities', () => {
  // self-constructed example: five output voltages, in production order
  const vout = [5.01, 4.99, 5.02, 5.0, 4.98];

  it('gives n, mean, sample σ, min and max (simple-statistics as reference)', () => {
    const [s] = summarizeQuantities(vout.map((x) => v(x)));
    expect(s.n).toBe(5);
    // simple-statistics mean, sampleStandardDeviation, min, max as reference
    expect(s.mean).toBeCloseTo(ss.mean(vout), 12);
    expect(s.sd).toBeCloseTo(ss.sampleStandardDeviation(vout), 12);
    expect(s.min).toBe(ss.min(vout));
    expect(s.max).toBe(ss.max(vout));
  });

  it('gives Cpk from the moving-range σ (NIST/SEMATECH e-Handbook §6.1.6 Cpk definition; MR̄/d2 with d2 = 1.128, Montgomery table VI)', () => {
    const [s] = summarizeQuantities(vout.map((x) => v(x)));
    // by hand: moving ranges 0.02, 0.03, 0.02, 0.02 → MR̄ = 0.0225; σ = 0.0225/1.128; mean 5.0
    const sigma = 0.0225 / 1.128;
    const expected = Math.min(5.1 - 5.0, 5.0 - 4.9) / (3 * sigma);
    expect(s.cpk).toBeCloseTo(expected, 3);
  });

  it('gives a one-sided Cpk with one limit, none without limits, and leaves yes/no results out', () => {
    const rows = summarizeQuantities([
      ...[20, 22, 21].map((x) => v(x, { stepKey: 'ripple', quantity: 'rippleMvPp', name: 'Ripple', stepName: 'Ripple', unit: 'mV', lowLimit: null, highLimit: 50 })),
      ...[1.2, 1.3].map((x) => v(x, { stepKey: 'info', quantity: 'tempC', name: 'Case temperature', stepName: 'Info', unit: '°C', lowLimit: null, highLimit: null })),
      ...[1, 1].map((x) => v(x, { stepKey: 'ocp', quantity: 'tripped', name: 'Trips', stepName: 'Protection', unit: 'flag' })),
    ]);
    expect(rows.map((r) => r.quantity)).toEqual(['rippleMvPp', 'tempC']);
    // by hand: mean 21, moving ranges 2, 1 → MR̄ 1.5, σ = 1.5/1.128; Cpu = (50 − 21)/(3σ)
    expect(rows[0].cpk).toBeCloseTo((50 - 21) / (3 * (1.5 / 1.128)), 6);
    expect(rows[1]).toMatchObject({ cpk: null, cpkNote: 'no limit' });
  });

  it('says why there is no Cpk for a single value or no spread', () => {
    expect(summarizeQuantities([v(5)])[0]).toMatchObject({ n: 1, sd: null, cpk: null, cpkNote: 'too few values' });
    expect(summarizeQuantities([v(5), v(5), v(5)])[0]).toMatchObject({ cpk: null, cpkNote: 'no spread' });
  });
});
