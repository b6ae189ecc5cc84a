import { describe, expect, it } from 'vitest';
import {
  capacitiveStepDeviationV,
  loadStepVoltageV,
  normalisedDeviationPulse,
  secondOrderOvershoot,
  secondOrderPeakTimeS,
  secondOrderStepResponse,
} from './load-step';

/** Largest value of f on [0, endS] by dense sampling, with its time. */
function maxOf(f: (t: number) => number, endS: number, n = 200_000): { value: number; tS: number } {
  let best = { value: -Infinity, tS: 0 };
  for (let i = 0; i <= n; i++) {
    const t = (i / n) * endS;
    const v = f(t);
    if (v > best.value) best = { value: v, tS: t };
  }
  return best;
}

describe('second-order step response', () => {
  it('overshoots by exp(−πζ/√(1 − ζ²)) at t_p = π/ω_d', () => {
    // second-order time-domain relations M_p = exp(−πζ/√(1−ζ²)), t_p = π/ω_d (control-engineering texts,
    // e.g. the "Design Considerations" page of a public control-theory wiki). Online overshoot-calculator
    // worked example: ζ = 0.3, ω_n = 10 rad/s → 37.23 %, t_p = 0.3293 s (its intermediate "37.30 %" line
    // is a rounding slip; exp(−0.98799) = 0.37234).
    const naturalHz = 10 / (2 * Math.PI);
    expect(secondOrderOvershoot(0.3)).toBeCloseTo(0.3723, 4);
    expect(secondOrderPeakTimeS(naturalHz, 0.3)).toBeCloseTo(0.3293, 4);
    const peak = maxOf((t) => secondOrderStepResponse(t, naturalHz, 0.3), 2);
    expect(peak.value - 1).toBeCloseTo(0.3723, 4);
    expect(peak.tS).toBeCloseTo(0.3293, 3);
  });

  it('gives the textbook 16.3 % overshoot at ζ = 0.5 and settles to 1', () => {
    // ζ = 0.5: M_p = exp(−π·0.5/√0.75) = exp(−1.813 799) = 0.163 034 (same relation, hand-computed)
    expect(secondOrderOvershoot(0.5)).toBeCloseTo(0.1630335, 6);
    const peak = maxOf((t) => secondOrderStepResponse(t, 1000, 0.5), 5e-3);
    expect(peak.value - 1).toBeCloseTo(0.1630335, 5);
    // settling: the envelope e^(−ζω_n t)/√(1−ζ²) is below 2 % after ≈ 4/(ζω_n) (common rule, 4.6 for 1 %)
    const tSettle = 4.6 / (0.5 * 2 * Math.PI * 1000);
    for (let t = tSettle; t < 5 * tSettle; t += tSettle / 50) {
      expect(Math.abs(secondOrderStepResponse(t, 1000, 0.5) - 1)).toBeLessThan(0.02);
    }
    expect(secondOrderStepResponse(-1, 1000, 0.5)).toBe(0);
  });
});

describe('deviation pulse', () => {
  it('peaks at exactly 1 and rings down by the overshoot ratio each half period', () => {
    // successive extrema of e^(−σt)·sin(ω_d t) are π/ω_d apart and shrink by exp(−πζ/√(1−ζ²)) (logarithmic
    // decrement of a damped oscillation, control-engineering texts)
    const naturalHz = 40e3;
    const zeta = 0.4;
    const omegaD = 2 * Math.PI * naturalHz * Math.sqrt(1 - zeta * zeta);
    const first = maxOf((t) => normalisedDeviationPulse(t, naturalHz, zeta), Math.PI / omegaD);
    expect(first.value).toBeCloseTo(1, 6);
    const second = maxOf((t) => -normalisedDeviationPulse(t + first.tS, naturalHz, zeta), (1.5 * Math.PI) / omegaD);
    expect(second.value).toBeCloseTo(secondOrderOvershoot(zeta), 4);
    expect(second.tS).toBeCloseTo(Math.PI / omegaD, 7);
  });
});

describe('load-step voltage', () => {
  const base = {
    vBeforeV: 5,
    vAfterV: 5,
    deltaA: 1.5,
    naturalHz: 40e3,
    damping: 0.5,
    capacitanceF: 47e-6,
    esrOhm: 0,
    slewS: 0,
  };

  it('dips by ΔI/(2π f_n C) when the ESR is zero and the DC level does not move', () => {
    // ΔV ≈ ΔI/(2π·f_c·C_out) is the usual first estimate of a load-step deviation for a loop of bandwidth f_c,
    // as regulator application notes give it (recalled from memory, not checked against a document).
    // ΔI/(2π·40 kHz·47 µF) = 1.5/11.812 388 = 0.126 985 V (hand-computed)
    expect(capacitiveStepDeviationV(1.5, 40e3, 47e-6)).toBeCloseTo(0.1269853, 6);
    // same estimate, 2.5 A into 100 µF with a 20 kHz loop: 2.5/(2π·20 kHz·100 µF) = 2.5/12.566 371 = 0.198 944 V
    expect(capacitiveStepDeviationV(2.5, 20e3, 100e-6)).toBeCloseTo(0.1989437, 6);
    const lowest = maxOf((t) => -loadStepVoltageV(t, base), 100e-6);
    expect(5 + lowest.value).toBeCloseTo(0.1269853, 5);
  });

  it('starts at V_before, adds the ESR step at once, and ends at V_after', () => {
    const p = { ...base, vAfterV: 4.99, esrOhm: 0.02, slewS: 1e-6 };
    expect(loadStepVoltageV(0, p)).toBe(5);
    expect(loadStepVoltageV(1e-9, p)).toBeCloseTo(5 - 1.5 * 0.02, 3);
    expect(loadStepVoltageV(1e-3, p)).toBeCloseTo(4.99, 9);
  });

  it('overshoots on load release (negative ΔI)', () => {
    const release = { ...base, deltaA: -1.5 };
    const highest = maxOf((t) => loadStepVoltageV(t, release), 100e-6);
    expect(highest.value - 5).toBeCloseTo(0.1269853, 5);
  });
});
