import { describe, expect, it } from 'vitest';
import {
  capRippleV,
  criticalLoadA,
  dcmConversionRatio,
  esrRippleV,
  idealDuty,
  inductorRippleApp,
  isDcm,
  kCrit,
  kFactor,
  lcCornerHz,
} from './buck';

const close = (actual: number, expected: number, rel = 1e-9) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * rel);

// check-values §2 worked example [X]: 24 V → 3.3 V, L = 22 µH, f = 250 kHz, C = 100 µF, ESR = 10 mΩ
const VIN = 24;
const VOUT = 3.3;
const L = 22e-6;
const F = 250e3;
const C = 100e-6;

describe('idealDuty', () => {
  it('is Vout/Vin (volt-second balance)', () => {
    // Erickson & Maksimović via check-values §2 step 1: D = 0.1375
    close(idealDuty(VIN, VOUT), 0.1375, 1e-12);
    // Semtech "Power supplies 101" (check-values §2): 12 V → 5 V gives D = 5/12
    close(idealDuty(12, 5), 0.4166666666667, 1e-12);
  });

  it('refuses a step-up request', () => {
    expect(() => idealDuty(5, 12)).toThrow(/buck converter needs/);
  });
});

describe('inductorRippleApp', () => {
  it('is (Vin − Vout)·D/(L·f)', () => {
    // check-values §2 step 4 (rftools.io formula, citing Erickson & Maksimović): 0.5175 A p-p
    close(inductorRippleApp(VIN, VOUT, L, F), 0.5175, 1e-12);
  });

  it('gives the corrected rftools.io example, 0.291667 A (the page prints "294 mV")', () => {
    // check-values §2 caution: 12 V → 5 V, 100 kHz, 100 µH → 7·(5/12)/(1e5·1e-4) = 0.291667 A
    close(inductorRippleApp(12, 5, 100e-6, 100e3), 0.2916666666667, 1e-12);
  });
});

describe('kFactor, kCrit, isDcm', () => {
  it('classifies the load sweep of the worked example', () => {
    // check-values §2 step 7: K = 11/R; CCM for R = 1, 3.3, 6.6 Ω; DCM for 20 and 50 Ω (Erickson & Maksimović §5.1)
    const d = idealDuty(VIN, VOUT);
    for (const [r, k, dcm] of [
      [1.0, 11.0, false],
      [3.3, 3.3333333333, false],
      [6.6, 1.6666666667, false],
      [20, 0.55, true],
      [50, 0.22, true],
    ] as const) {
      close(kFactor(L, r, F), k, 1e-9);
      expect(isDcm(kFactor(L, r, F), d)).toBe(dcm);
    }
  });

  it('puts the boundary at K_crit = 1 − D = 0.8625, i.e. R_crit = 12.7536 Ω', () => {
    // check-values §2 steps 1–2 (wyzant worked answer R_crit = 2Lf/D′): R_crit = 12.75362319 Ω
    close(kCrit(0.1375), 0.8625, 1e-12);
    const rCrit = (2 * L * F) / (1 - 0.1375);
    close(rCrit, 12.75362319, 1e-9);
    close(kFactor(L, rCrit, F), kCrit(0.1375), 1e-12);
    expect(isDcm(kFactor(L, rCrit * 1.001, F), 0.1375)).toBe(true);
    expect(isDcm(kFactor(L, rCrit * 0.999, F), 0.1375)).toBe(false);
  });
});

describe('criticalLoadA', () => {
  it('is ΔI_L/2 = Vout/R_crit', () => {
    // check-values §2 step 3: I_crit = 0.25875 A; equals ΔI_L/2 of step 4
    close(criticalLoadA(VIN, VOUT, L, F), 0.25875, 1e-12);
    close(criticalLoadA(VIN, VOUT, L, F), VOUT / 12.753623188405797, 1e-12);
  });

  it('is half the corrected rftools.io ripple', () => {
    close(criticalLoadA(12, 5, 100e-6, 100e3), 0.1458333333333, 1e-12);
  });
});

describe('dcmConversionRatio', () => {
  it('gives M = 0.253315 at R = 50 Ω with D held at 0.1375', () => {
    // check-values §2 step 8 (formula Erickson & Maksimović ch. 5, recalled from memory [M]): M = 0.253315, 6.079550 V
    const m = dcmConversionRatio(0.22, 0.1375);
    close(m, 0.2533145831, 1e-9);
    close(m * VIN, 6.07955, 1e-6);
  });

  it('meets the CCM ratio M = D at the boundary (continuity check) and inverts to D = M·√(K/(1 − M))', () => {
    close(dcmConversionRatio(kCrit(0.1375), 0.1375), 0.1375, 1e-12);
    close(dcmConversionRatio(kCrit(0.6), 0.6), 0.6, 1e-12);
    // check-values §2 step 8: the duty for 3.3 V at 50 Ω is 0.069444
    const d = 0.1375 * Math.sqrt(0.22 / (1 - 0.1375));
    close(d, 0.069444, 1e-5);
    close(dcmConversionRatio(0.22, d), 0.1375, 1e-12);
  });

  it('refuses a K in continuous conduction', () => {
    expect(() => dcmConversionRatio(1.0, 0.1375)).toThrow(/in CCM/);
  });
});

describe('lcCornerHz', () => {
  it('is 1/(2π√(LC))', () => {
    // check-values §2 step 5: 3393.194788 Hz
    close(lcCornerHz(L, C), 3393.194788, 1e-9);
    // standard LC resonance: L = 10 µH, C = 10 µF → ω = 1e5 rad/s → 15 915.494 Hz
    close(lcCornerHz(10e-6, 10e-6), 1e5 / (2 * Math.PI), 1e-12);
  });
});

describe('capRippleV and esrRippleV', () => {
  it('give 2.5875 mV and 5.175 mV for the worked example', () => {
    // check-values §2 step 6 (rftools.io citing Erickson; cal16.calculator.city guide): ΔI/(8fC) and ΔI·ESR
    close(capRippleV(0.5175, F, C), 2.5875e-3, 1e-12);
    close(esrRippleV(0.5175, 0.01), 5.175e-3, 1e-12);
  });

  it('give the corrected rftools.io example figures', () => {
    // ΔI_L = 0.291667 A at 100 kHz with 100 µF → 3.6458 mV; with 20 mΩ ESR → 5.8333 mV
    close(capRippleV(0.2916666666667, 100e3, 100e-6), 0.0036458333333, 1e-9);
    close(esrRippleV(0.2916666666667, 0.02), 0.0058333333333, 1e-9);
  });

  it('refuse negative inputs', () => {
    expect(() => esrRippleV(-1, 0.01)).toThrow(RangeError);
    expect(() => capRippleV(0.5, 0, C)).toThrow(/fHz/);
  });
});

describe('L_crit relation (check-values §2 step 9)', () => {
  it('L_crit = (1 − D)·R·T_s/2 = 11.385 µH for CCM down to 0.5 A; K equals K_crit there', () => {
    const lCrit = ((1 - 0.1375) * 6.6 * 4e-6) / 2;
    close(lCrit, 11.385e-6, 1e-9);
    close(kFactor(lCrit, 6.6, F), kCrit(0.1375), 1e-12);
  });
});
