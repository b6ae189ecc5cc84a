import { describe, expect, it } from 'vitest';
import { capacitiveRippleVpp, dcmCapacitiveRippleVpp } from './buck-relations';
import { solveOperatingPoint } from './operating-point';
import { rippleWaveform } from './ripple-waveform';
import { workedExampleUnit } from '../test-support/test-units';

// self-constructed example (see buck-relations.spec.ts): ΔI_L = 0.5175 A, D = 0.1375, f = 250 kHz, C = 100 µF,
// ESR = 10 mΩ
const CCM = { kind: 'ccm' as const, duty: 0.1375, rippleApp: 0.5175 };

describe('CCM ripple waveform', () => {
  it('has the capacitive p-p ΔI/(8fC) when the ESR is zero', () => {
    // ΔI_L/(8fC) (Fundamentals of Power Electronics) by hand: 0.5175/200 = 2.5875 mV
    const w = rippleWaveform(CCM, 2, 250e3, 100e-6, 0);
    expect(w.vppV).toBeCloseTo(2.5875e-3, 8);
    // same formula for another stage: 12 V → 5 V, 100 kHz, 100 µH → ΔI = 0.291 667 A (the rftools.io ripple
    // calculator's stage, recomputed by hand);
    // with 47 µF: 0.291667/(8·1e5·47e-6) = 7.757 mV
    const other = rippleWaveform({ kind: 'ccm', duty: 5 / 12, rippleApp: 0.2916666667 }, 1, 100e3, 47e-6, 0);
    expect(other.vppV).toBeCloseTo(capacitiveRippleVpp(0.2916666667, 100e3, 47e-6), 8);
  });

  it('has the ESR p-p ΔI·ESR and a triangle’s rms when the capacitance is huge', () => {
    // ESR term ΔI_L·ESR by hand: 0.5175 × 0.01 = 5.175 mV
    const w = rippleWaveform(CCM, 2, 250e3, 1e3, 0.01);
    expect(w.vppV).toBeCloseTo(5.175e-3, 8);
    // an ideal triangle has rms Vpp/(2√3) (standard relation); sample it densely
    const n = 100_000;
    let sumSq = 0;
    for (let i = 0; i < n; i++) sumSq += w.at((i / n) * 4e-6) ** 2;
    expect(Math.sqrt(sumSq / n)).toBeCloseTo(5.175e-3 / (2 * Math.sqrt(3)), 7);
  });

  it('stays between the larger term and the conservative sum, with zero mean', () => {
    const w = rippleWaveform(CCM, 2, 250e3, 100e-6, 0.01);
    expect(w.vppV).toBeGreaterThan(5.175e-3);
    expect(w.vppV).toBeLessThanOrEqual(7.7625e-3);
    let sum = 0;
    for (let i = 0; i < 1000; i++) sum += w.at((i / 1000) * 4e-6);
    expect(Math.abs(sum / 1000)).toBeLessThan(1e-7);
  });

  it('repeats every switching period', () => {
    const w = rippleWaveform(CCM, 2, 250e3, 100e-6, 0.01);
    for (const t of [0.3e-6, 1.7e-6, 3.9e-6]) expect(w.at(t + 3 * 4e-6)).toBeCloseTo(w.at(t), 12);
  });
});

describe('DCM ripple waveform', () => {
  const unit = workedExampleUnit({ esrOhm: 0 });
  const op = solveOperatingPoint(unit, { sourceOn: true, vinV: 24, loadA: 3.3 / 50 });

  it('matches the DCM charge expression when the ESR is zero', () => {
    if (op.inductorCurrent.kind !== 'dcm') throw new Error('expected DCM');
    const s = op.inductorCurrent;
    const w = rippleWaveform(s, op.ioutA, 250e3, 100e-6, 0);
    // DCM charge: ΔQ = T1·(I_pk − I_o)²/(2·I_pk), which meets ΔI/(8fC) at the boundary (buck-relations.spec)
    expect(w.vppV).toBeCloseTo(dcmCapacitiveRippleVpp(s.peakA, op.ioutA, (s.duty + s.freewheelDuty) * 4e-6, 100e-6), 8);
  });

  it('changes shape: the output falls in a straight line while the inductor is idle', () => {
    if (op.inductorCurrent.kind !== 'dcm') throw new Error('expected DCM');
    const s = op.inductorCurrent;
    const w = rippleWaveform(s, op.ioutA, 250e3, 100e-6, 0);
    // idle interval: i_C = −I_o, so dv/dt = −I_o/C exactly
    const t0 = (s.duty + s.freewheelDuty) * 4e-6 + 0.1e-6;
    const t1 = 4e-6 - 0.1e-6;
    expect((w.at(t1) - w.at(t0)) / (t1 - t0)).toBeCloseTo(-op.ioutA / 100e-6, 3);
  });
});
