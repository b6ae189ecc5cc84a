import { describe, expect, it } from 'vitest';
import {
  capacitiveRippleVpp,
  criticalInductanceH,
  criticalLoadCurrentA,
  criticalLoadOhm,
  dcmCapacitiveRippleVpp,
  dcmConversionRatio,
  dcmDutyForRatio,
  dimensionlessK,
  esrRippleVpp,
  idealDuty,
  inductorRippleApp,
  kCrit,
  lcCornerHz,
  outputRippleVpp,
  switchingLossW,
} from './buck-relations';

// self-constructed example: V_in = 24 V, V_out = 3.3 V, L = 22 µH, f = 250 kHz, C = 100 µF, ESR = 10 mΩ
// (relations from Erickson & Maksimović, Fundamentals of Power Electronics, see docs/reference.md; numbers by hand)
const EX = { vinV: 24, voutV: 3.3, l: 22e-6, f: 250e3, c: 100e-6, esr: 0.01 };

describe('duty cycle', () => {
  it('is V_out/V_in', () => {
    // ideal CCM duty D = V_out/V_in (Semtech "Power Supplies 101" tutorial): 3.3/24 = 0.1375
    expect(idealDuty(EX.vinV, EX.voutV)).toBeCloseTo(0.1375, 12);
    // the rftools.io ripple calculator's example stage: 12 V → 5 V gives D = 5/12
    expect(idealDuty(12, 5)).toBeCloseTo(5 / 12, 12);
  });
});

describe('inductor ripple ΔI_L = (V_in − V_out)·D/(L·f)', () => {
  it('matches the worked examples', () => {
    // self-constructed example by hand: (24 − 3.3)·0.1375/(22 µH·250 kHz) = 2.846 25/5.5 = 0.517 500 A p-p
    expect(inductorRippleApp(EX.vinV, EX.voutV, 0.1375, EX.l, EX.f)).toBeCloseTo(0.5175, 10);
    // rftools.io ripple calculator stage 12 V → 5 V, 100 kHz, 100 µH: by hand 7·(5/12)/(1e5·1e-4) = 0.291 667 A
    // (the page itself prints "294 mV", which is wrong in value and unit)
    expect(inductorRippleApp(12, 5, 5 / 12, 100e-6, 100e3)).toBeCloseTo(0.291667, 6);
  });
});

describe('mode boundary', () => {
  it('gives R_crit, I_crit and K_crit of the worked example', () => {
    // self-constructed example by hand: K_crit = 1 − 0.1375 = 0.8625, R_crit = 11/0.8625 = 12.753 623 19 Ω,
    // I_crit = 3.3/R_crit = 0.258 75 A
    expect(kCrit(0.1375)).toBeCloseTo(0.8625, 12);
    // mode boundary K_crit(D) = 1 − D (Erickson & Maksimović, Fundamentals of Power Electronics, ch. 5 §5.1) at the
    // rftools.io example stage's D = 5/12
    expect(kCrit(5 / 12)).toBeCloseTo(7 / 12, 12);
    expect(criticalLoadOhm(EX.l, EX.f, 0.1375)).toBeCloseTo(12.75362319, 7);
    expect(criticalLoadCurrentA(EX.voutV, EX.l, EX.f, 0.1375)).toBeCloseTo(0.25875, 9);
    // I_crit = ΔI_L/2 in the ideal converter (follows from the two relations above; by hand 0.5175/2 = 0.258 75 A)
    expect(criticalLoadCurrentA(EX.voutV, EX.l, EX.f, 0.1375)).toBeCloseTo(
      inductorRippleApp(EX.vinV, EX.voutV, 0.1375, EX.l, EX.f) / 2,
      12,
    );
  });

  it('gives R_crit and I_crit of the rftools.io example stage (12 V → 5 V, 100 kHz, 100 µH)', () => {
    // R_crit = 2Lf/(1 − D) (from K = K_crit, Fundamentals of Power Electronics ch. 5 §5.1), hand-computed here:
    // 2·100 µH·100 kHz / (7/12) = 20·12/7 = 34.285 714 Ω
    const d = 5 / 12;
    expect(criticalLoadOhm(100e-6, 100e3, d)).toBeCloseTo(240 / 7, 9);
    // I_crit = V_out/R_crit = 0.145 833 A must be half the stage's ΔI_L = 0.291 667 A (hand arithmetic)
    expect(criticalLoadCurrentA(5, 100e-6, 100e3, d)).toBeCloseTo(0.291667 / 2, 6);
    expect(criticalLoadCurrentA(5, 100e-6, 100e3, d)).toBeCloseTo(inductorRippleApp(12, 5, d, 100e-6, 100e3) / 2, 12);
  });

  it('classifies the loads of the worked-example table', () => {
    // self-constructed example, K = 2L/(R·T_s) = 11/R by hand: R = 1 → 11 (CCM), 6.6 → 1.6667 (CCM), 20 → 0.55 (DCM),
    // 50 → 0.22 (DCM)
    const rows: Array<[number, number, 'CCM' | 'DCM']> = [
      [1.0, 11.0, 'CCM'],
      [3.3, 3.3333, 'CCM'],
      [6.6, 1.6667, 'CCM'],
      [20, 0.55, 'DCM'],
      [50, 0.22, 'DCM'],
    ];
    for (const [r, k, mode] of rows) {
      const kValue = dimensionlessK(EX.l, r, EX.f);
      expect(kValue).toBeCloseTo(k, 4);
      expect(kValue > kCrit(0.1375) ? 'CCM' : 'DCM').toBe(mode);
    }
    // at the boundary resistance K equals K_crit exactly
    expect(dimensionlessK(EX.l, 12.753623188405797, EX.f)).toBeCloseTo(0.8625, 9);
  });

  it('gives the critical inductance', () => {
    // self-constructed example by hand: CCM down to 0.5 A (R = 6.6 Ω) needs L_crit = 0.8625·6.6·4 µs/2 = 11.385 µH
    expect(criticalInductanceH(0.1375, 6.6, EX.f)).toBeCloseTo(11.385e-6, 9);
    // and the worked example's own boundary resistance needs exactly the 22 µH it has
    expect(criticalInductanceH(0.1375, 12.753623188405797, EX.f)).toBeCloseTo(22e-6, 12);
  });
});

describe('DCM conversion ratio', () => {
  it('matches the worked example at R = 50 Ω', () => {
    // DCM ratio M = 2/(1 + √(1 + 4K/D²)) (Fundamentals of Power Electronics ch. 5; formula from memory, unverified,
    // hence the continuity and inverse checks below); self-constructed example by hand: M = 0.253 315 with
    // D = 0.1375, so the open-loop output is 6.079 550 V
    const m = dcmConversionRatio(0.1375, 0.22);
    expect(m).toBeCloseTo(0.253315, 6);
    expect(m * 24).toBeCloseTo(6.07955, 5);
    // and the duty for 3.3 V at 50 Ω is 0.069 444
    expect(dcmDutyForRatio(3.3 / 24, 0.22)).toBeCloseTo(0.069444, 6);
  });

  it('meets the CCM ratio at the boundary (continuity check M(K_crit) = D)', () => {
    // continuity with CCM: at K = 1 − D, √(1 + 4K/D²) = (2 − D)/D, so M = D exactly (hand derivation)
    for (const d of [0.1, 0.1375, 0.4, 0.75]) {
      expect(dcmConversionRatio(d, kCrit(d))).toBeCloseTo(d, 12);
      expect(dcmDutyForRatio(d, kCrit(d))).toBeCloseTo(d, 12);
    }
  });

  it('inverts: the duty found for M gives M back', () => {
    // D = M·√(K/(1 − M)) is the inverse of M = 2/(1 + √(1 + 4K/D²)) (solved by hand)
    for (const [m, k] of [
      [0.1375, 0.22],
      [0.5, 0.1],
      [0.3, 0.05],
    ]) {
      expect(dcmConversionRatio(dcmDutyForRatio(m, k), k)).toBeCloseTo(m, 12);
    }
  });
});

describe('LC corner and output ripple', () => {
  it('gives f_c of the worked example', () => {
    // f_c = 1/(2π√(LC)) on the self-constructed example, by hand: 3 393.194 788 Hz
    expect(lcCornerHz(EX.l, EX.c)).toBeCloseTo(3393.194788, 5);
    // 10 µH with 10 µF: 1/(2π·10 µs) = 15 915.494 Hz (same standard formula, hand-computed)
    expect(lcCornerHz(10e-6, 10e-6)).toBeCloseTo(15915.494309, 5);
  });

  it('gives the capacitive and ESR ripple terms', () => {
    // ΔV_C = ΔI_L/(8fC) (Fundamentals of Power Electronics, as quoted by the rftools.io ripple calculator);
    // self-constructed example by hand: 0.5175/200 = 2.5875 mV; ESR term 0.5175 × 0.01 = 5.175 mV
    expect(capacitiveRippleVpp(0.5175, EX.f, EX.c)).toBeCloseTo(2.5875e-3, 12);
    expect(esrRippleVpp(0.5175, EX.esr)).toBeCloseTo(5.175e-3, 12);
    expect(outputRippleVpp(0.5175, EX.f, EX.c, EX.esr)).toBeCloseTo(7.7625e-3, 12);
    // same relations on the rftools.io example stage, ΔI_L = 0.291 667 A,
    // with 47 µF and 20 mΩ, hand-computed: 0.291 667/(8·100 kHz·47 µF) = 7.757 092 mV; 0.291 667·0.02 = 5.833 333 mV, sum 13.590 426 mV
    const cautionRippleA = 7 * (5 / 12) / (100e3 * 100e-6);
    expect(capacitiveRippleVpp(cautionRippleA, 100e3, 47e-6)).toBeCloseTo(7.757092e-3, 9);
    expect(esrRippleVpp(cautionRippleA, 0.02)).toBeCloseTo(5.833333e-3, 9);
    expect(outputRippleVpp(cautionRippleA, 100e3, 47e-6, 0.02)).toBeCloseTo(13.5904255e-3, 9);
  });

  it('DCM capacitive ripple meets ΔI/(8fC) at the boundary', () => {
    // at the boundary I_pk = ΔI_L = 2·I_o and the current flows the whole period: the DCM charge
    // expression must give the CCM result ΔI_L/(8fC) of the self-constructed example (2.5875 mV)
    expect(dcmCapacitiveRippleVpp(0.5175, 0.25875, 1 / EX.f, EX.c)).toBeCloseTo(2.5875e-3, 12);
    const fOther = 500e3;
    expect(dcmCapacitiveRippleVpp(1.2, 0.6, 1 / fOther, 47e-6)).toBeCloseTo(capacitiveRippleVpp(1.2, fOther, 47e-6), 12);
  });
});

describe('switching loss P = ½·V_in·I·(t_r + t_f)·f', () => {
  it('matches the overlap-loss expression', () => {
    // the overlap-loss estimate ½·V_in·I_out·(t_r + t_f)·f_sw of regulator application notes (common practice,
    // no source); numbers hand-computed:
    // 12 V, 3 A, t_r + t_f = 20 ns, 500 kHz → 0.18 W
    expect(switchingLossW(10e-9, 12, 3, 500e3)).toBeCloseTo(0.18, 12);
    // 24 V, 5 A, 16 ns total, 400 kHz → ½·24·5·16e-9·4e5 = 0.384 W
    expect(switchingLossW(8e-9, 24, 5, 400e3)).toBeCloseTo(0.384, 12);
  });
});
