import { describe, expect, it } from 'vitest';
import {
  DEFECTS,
  DEMO_DEFECT_RATES,
  SimulatorConfigError,
  applyDefect,
  defectFor,
  validateSimulatorConfig,
  type SimulatorConfig,
} from './defects';
import { PRODUCTS } from './products';
import { nominalUnit } from './test-support/test-units';
import { modelUnit } from './unit-model';

const serial = (n: number) => `K5A-2648-${String(n).padStart(5, '0')}`;

describe('defectFor', () => {
  it('is deterministic per serial', () => {
    for (let n = 0; n < 200; n++) {
      expect(defectFor(serial(n), 'LB-2648-03')).toBe(defectFor(serial(n), 'LB-2648-03'));
    }
  });

  it('honours the configured rates over many serials', () => {
    const config: SimulatorConfig = { defectRates: { weak_switch: 0.05, open_output: 0.02 } };
    const n = 20_000;
    const counts: Record<string, number> = {};
    for (let i = 0; i < n; i++) {
      const c = defectFor(serial(i), 'L', config);
      counts[c] = (counts[c] ?? 0) + 1;
    }
    // binomial: mean n·p, standard deviation √(n·p·(1 − p)); allow 4 standard deviations
    for (const [name, p] of [
      ['weak_switch', 0.05],
      ['open_output', 0.02],
    ] as const) {
      const sd = Math.sqrt(n * p * (1 - p));
      expect(Math.abs((counts[name] ?? 0) - n * p)).toBeLessThan(4 * sd);
    }
    expect(counts.aged_output_cap).toBeUndefined();
  });

  it('lets a lot replace the global rate and a serial override everything', () => {
    const config: SimulatorConfig = {
      defectRates: { weak_switch: 0 },
      lots: { 'LB-BAD': { defectRates: { weak_switch: 1 } } },
      serials: { [serial(7)]: 'good', [serial(8)]: 'no_protection' },
    };
    expect(defectFor(serial(1), 'LB-OK', config)).toBe('good');
    expect(defectFor(serial(1), 'LB-BAD', config)).toBe('weak_switch');
    expect(defectFor(serial(7), 'LB-BAD', config)).toBe('good');
    expect(defectFor(serial(8), 'LB-OK', config)).toBe('no_protection');
  });

  it('uses the demo rates by default (about 3 % defective)', () => {
    const total = Object.values(DEMO_DEFECT_RATES).reduce((a, b) => a + b, 0);
    expect(total).toBeCloseTo(0.03, 9);
    let bad = 0;
    for (let i = 0; i < 10_000; i++) if (defectFor(serial(i), 'L') !== 'good') bad++;
    const sd = Math.sqrt(10_000 * total * (1 - total));
    expect(Math.abs(bad - 10_000 * total)).toBeLessThan(4 * sd);
  });
});

describe('validateSimulatorConfig', () => {
  it('accepts a good configuration', () => {
    const config = { defectRates: { weak_switch: 0.1 }, lots: { L: { defectRates: { open_output: 0.2 } } }, serials: { S: 'good' } };
    expect(validateSimulatorConfig(config)).toBe(config);
  });

  it('lists every problem at once', () => {
    try {
      validateSimulatorConfig({
        defectRates: { weak_switch: 1.5, melted: 0.1 },
        lots: { L: { defectRates: { open_output: -1 }, extra: 1 } },
        serials: { S: 'broken' },
        colour: 'red',
      });
      throw new Error('should have thrown');
    } catch (error) {
      expect(error).toBeInstanceOf(SimulatorConfigError);
      const problems = (error as SimulatorConfigError).problems.join('\n');
      expect(problems).toMatch(/unknown key "colour"/);
      expect(problems).toMatch(/defectRates.weak_switch must be a number from 0 to 1/);
      expect(problems).toMatch(/defectRates.melted is not a defect/);
      expect(problems).toMatch(/lots.L.extra is not allowed/);
      expect(problems).toMatch(/lots.L.defectRates.open_output must be a number from 0 to 1/);
      expect(problems).toMatch(/serials.S must be "good" or one of/);
    }
  });

  it('refuses rates that add up to more than 1', () => {
    expect(() => validateSimulatorConfig({ defectRates: { weak_switch: 0.6, open_output: 0.6 } })).toThrow(/more than 1/);
    expect(() => validateSimulatorConfig([])).toThrow(/JSON object/);
  });
});

describe('applyDefect', () => {
  const product = PRODUCTS['OB-BK0503'];
  const base = nominalUnit(product);

  it('moves the set point 6–10 % for wrong_feedback, either way across serials', () => {
    const signs = new Set<number>();
    for (let n = 0; n < 40; n++) {
      const u = applyDefect({ ...base, serial: serial(n) }, 'wrong_feedback');
      const offset = u.setPointV / product.voutV - 1;
      expect(Math.abs(offset)).toBeGreaterThanOrEqual(0.06);
      expect(Math.abs(offset)).toBeLessThanOrEqual(0.1);
      signs.add(Math.sign(offset));
    }
    expect(signs).toEqual(new Set([-1, 1]));
  });

  it('scales the capacitor for aged_output_cap and the switches for weak_switch', () => {
    const aged = applyDefect(base, 'aged_output_cap');
    expect(aged.design.esrOhm).toBeCloseTo(4 * base.design.esrOhm, 12);
    expect(aged.design.capacitanceF).toBeCloseTo(base.design.capacitanceF / 3, 15);
    expect(aged.design.loopDamping).toBeLessThan(base.design.loopDamping);
    const weak = applyDefect(base, 'weak_switch');
    expect(weak.design.ronHighOhm).toBeCloseTo(4 * base.design.ronHighOhm, 12);
    expect(base.design.ronHighOhm).toBe(product.design.ronHighOhm);
  });

  it('flags open_output and no_protection and leaves intermittent_contact to the fixture', () => {
    expect(applyDefect(base, 'open_output').outputOpen).toBe(true);
    expect(applyDefect(base, 'no_protection').noProtection).toBe(true);
    expect(applyDefect(base, 'intermittent_contact')).toBe(base);
    expect(DEFECTS).toHaveLength(6);
  });
});

describe('modelUnit', () => {
  it('gives the same unit for the same serial and different units for different serials', () => {
    const id = { serial: serial(1), partNumber: 'OB-BK0503', lotCode: 'LB-2648-03' };
    const a = modelUnit(id, PRODUCTS['OB-BK0503'], 'good');
    const b = modelUnit({ ...id }, PRODUCTS['OB-BK0503'], 'good');
    const c = modelUnit({ ...id, serial: serial(2) }, PRODUCTS['OB-BK0503'], 'good');
    expect(a.model).toEqual(b.model);
    expect(c.model.setPointV).not.toBe(a.model.setPointV);
  });

  it('spreads good set points around nominal with σ near tolerance/4', () => {
    const product = PRODUCTS['OB-BK0503'];
    const errors: number[] = [];
    for (let n = 0; n < 2000; n++) {
      const u = modelUnit({ serial: serial(n), partNumber: product.partNumber, lotCode: 'L1' }, product, 'good');
      errors.push((u.model.setPointV / product.voutV - 1) * 100);
    }
    const mean = errors.reduce((a, b) => a + b, 0) / errors.length;
    const sd = Math.sqrt(errors.reduce((a, b) => a + (b - mean) ** 2, 0) / (errors.length - 1));
    // σ_unit = 1.5 %/4 = 0.375 %; the lot offset (σ = 0.125 %) is shared, so it shifts the mean only
    expect(sd).toBeGreaterThan(0.33);
    expect(sd).toBeLessThan(0.42);
    expect(Math.abs(mean)).toBeLessThan(0.5);
  });
});
