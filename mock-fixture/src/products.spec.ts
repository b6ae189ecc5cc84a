import { describe, expect, it } from 'vitest';
import { criticalLoadCurrentA, inductorRippleApp, lcCornerHz } from './physics/buck-relations';
import { solveOperatingPoint } from './physics/operating-point';
import { nominalUnit } from './test-support/test-units';
import { PRODUCTS, findProduct, genericProduct } from './products';

describe('demo catalogue', () => {
  it('carries the ratings of docs/architecture.md', () => {
    // docs/architecture.md "Demo plant" table
    const expected = {
      'OB-BK0503': { vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutV: 5.0, ioutRatedA: 3.0, serial: 'K5A-2648-00001' },
      'OB-BK3305': { vinMinV: 18, vinNomV: 24, vinMaxV: 36, voutV: 3.3, ioutRatedA: 5.0, serial: 'K3E-2648-00001' },
      'OB-BK1202': { vinMinV: 16, vinNomV: 24, vinMaxV: 32, voutV: 12.0, ioutRatedA: 2.0, serial: 'KC2-2648-00001' },
    };
    expect(Object.keys(PRODUCTS).sort()).toEqual(Object.keys(expected).sort());
    for (const [part, e] of Object.entries(expected)) {
      const p = PRODUCTS[part];
      expect(p).toMatchObject({ vinMinV: e.vinMinV, vinNomV: e.vinNomV, vinMaxV: e.vinMaxV, voutV: e.voutV, ioutRatedA: e.ioutRatedA });
      expect(new RegExp(p.serialPattern!).test(e.serial)).toBe(true);
    }
  });

  it('has designs inside the usual rules of thumb', () => {
    for (const p of Object.values(PRODUCTS)) {
      const d = p.design;
      const duty = p.voutV / p.vinNomV;
      const ripple = inductorRippleApp(p.vinNomV, p.voutV, duty, d.inductanceH, d.switchingHz);
      // inductor ripple 15–45 % of rated current (common practice, no source; 20–40 % is the usual target)
      expect(ripple / p.ioutRatedA).toBeGreaterThan(0.15);
      expect(ripple / p.ioutRatedA).toBeLessThan(0.45);
      // the LC corner sits well below the switching frequency and the loop between them
      expect(lcCornerHz(d.inductanceH, d.capacitanceF)).toBeLessThan(d.switchingHz / 20);
      expect(d.loopNaturalHz).toBeLessThan(d.switchingHz / 5);
      // DCM only at light load: below 20 % of rated current at nominal line
      // (I_crit = V_out/R_crit, Fundamentals of Power Electronics ch. 5 §5.1)
      expect(criticalLoadCurrentA(p.voutV, d.inductanceH, d.switchingHz, duty)).toBeLessThan(0.2 * p.ioutRatedA);
      expect(d.currentLimitA).toBeGreaterThan(1.2 * p.ioutRatedA);
      // the whole input range runs without lock-out
      expect(d.uvloV).toBeLessThan(p.vinMinV);
      expect(d.ovloV).toBeGreaterThan(p.vinMaxV);
    }
  });
});

describe('generic fallback', () => {
  it('builds a working design from the ratings alone', () => {
    const p = genericProduct({ partNumber: 'XX-1', vinNomV: 48, voutV: 5, ioutRatedA: 4 });
    const d = p.design;
    // 30 % ripple at nominal line by construction (ΔI_L = (V_in − V_out)·D/(L·f), Fundamentals of Power Electronics)
    expect(inductorRippleApp(48, 5, 5 / 48, d.inductanceH, d.switchingHz)).toBeCloseTo(1.2, 9);
    const op = solveOperatingPoint(nominalUnit(p), { sourceOn: true, vinV: 48, loadA: 4 });
    expect(op.mode).toBe('ccm');
    expect(op.voutV).toBeGreaterThan(4.9);
    expect(op.efficiencyPct).toBeGreaterThan(85);
    expect(op.efficiencyPct).toBeLessThan(97);
  });

  it('refuses ratings that are not a step-down converter, saying why', () => {
    expect(() => genericProduct({ partNumber: 'X', vinNomV: 5, voutV: 12, ioutRatedA: 1 })).toThrow(/below the lowest input/);
    expect(() => genericProduct({ partNumber: 'X', vinNomV: 12, voutV: 5, ioutRatedA: 0 })).toThrow(/ioutRatedA must be a positive number/);
    expect(() => genericProduct({ partNumber: 'X', vinNomV: 12, vinMinV: 14, voutV: 5, ioutRatedA: 1 })).toThrow(/min ≤ nom ≤ max/);
  });

  it('is what findProduct returns for ratings-only entries; built-ins stay reachable', () => {
    const extra = { 'ZZ-9': { partNumber: 'ZZ-9', vinNomV: 12, voutV: 3.3, ioutRatedA: 2 } };
    expect(findProduct('ZZ-9', extra)?.family).toBe('generic');
    expect(findProduct('OB-BK0503', extra)?.family).toBe('BK compact');
    expect(findProduct('NOPE', extra)).toBeUndefined();
  });
});
