import { standardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { acRmsMv, lowPass, rippleMvPp } from './ripple';

const close = (actual: number, expected: number, rel: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * rel);

/** n samples of a sine of amplitude a (peak) at f, sampled at fs, starting at phase 0. */
function sine(n: number, a: number, fHz: number, fsHz: number, offset = 0): number[] {
  return Array.from({ length: n }, (_, i) => offset + a * Math.sin((2 * Math.PI * fHz * i) / fsHz));
}

/**
 * Amplitude of the component at fHz over samples [from, to), by correlation with sin and cos
 * (exact for a pure sine when the window holds whole periods).
 */
function amplitudeAt(x: number[], fHz: number, fsHz: number, from: number, to: number): number {
  let s = 0;
  let c = 0;
  for (let i = from; i < to; i++) {
    s += x[i] * Math.sin((2 * Math.PI * fHz * i) / fsHz);
    c += x[i] * Math.cos((2 * Math.PI * fHz * i) / fsHz);
  }
  const n = to - from;
  return (2 / n) * Math.hypot(s, c);
}

/**
 * Textbook gain of the chosen filter: Butterworth squared magnitude 1/(1 + (Ω/Ω_c)^(2N)), N = 2, evaluated at
 * the bilinear-transform warped frequency Ω = tan(πf/f_s) (Oppenheim & Schafer, Discrete-Time Signal Processing,
 * bilinear transformation; section number not given because it is recalled from memory); run forward and backward the amplitude gain is that squared magnitude, with the section's cutoff
 * raised by 1/(√2 − 1)^(1/4) so the pair is −3 dB at f_c.
 */
function textbookGain(fHz: number, fcHz: number, fsHz: number): number {
  const w = Math.tan((Math.PI * fHz) / fsHz);
  const wd = Math.tan((Math.PI * fcHz) / fsHz) / Math.pow(Math.SQRT2 - 1, 1 / 4);
  return 1 / (1 + Math.pow(w / wd, 4));
}

describe('lowPass (2nd-order Butterworth, forward-backward)', () => {
  const fs = 1e9;
  const fc = 20e6;
  const n = 4000; // 80 whole periods of 20 MHz at 1 GS/s

  it('is −3 dB at the cutoff, as the Butterworth gain formula says', () => {
    // Butterworth |H|² = 1/(1 + (Ω/Ω_c)^4) → the two-pass amplitude at f_c is 1/√2 = −3.0103 dB
    const y = lowPass(sine(n, 1, fc, fs), fs, fc);
    const gain = amplitudeAt(y, fc, fs, 1000, 3000);
    close(gain, Math.SQRT1_2, 1e-4);
    close(20 * Math.log10(gain), -3.0103, 1e-3);
  });

  it('matches the textbook gain below and above the cutoff', () => {
    for (const f of [5e6, 10e6, 40e6, 100e6]) {
      const y = lowPass(sine(n, 1, f, fs), fs, fc);
      const gain = amplitudeAt(y, f, fs, 1000, 3000);
      // relative for the pass band, absolute floor for the deep stop band
      expect(Math.abs(gain - textbookGain(f, fc, fs))).toBeLessThanOrEqual(1e-4 * textbookGain(f, fc, fs) + 1e-7);
    }
  });

  it('in the analogue limit gives the Butterworth figure 1/(1 + (√2 − 1)·(f/f_c)^4) (−12 dB/octave per pass)', () => {
    // Butterworth squared magnitude with N = 2 (Oppenheim & Schafer, Butterworth filter design), f ≪ f_s so warping is negligible
    const fsHigh = 1e6;
    const y = lowPass(sine(20000, 1, 2000, fsHigh), fsHigh, 1000);
    const gain = amplitudeAt(y, 2000, fsHigh, 5000, 15000);
    close(gain, 1 / (1 + (Math.SQRT2 - 1) * 16), 1e-3);
  });

  it('leaves a constant record unchanged (unity DC gain) and keeps the length', () => {
    const y = lowPass(new Array(100).fill(5.0), fs, fc);
    expect(y).toHaveLength(100);
    for (const v of y) close(v, 5.0, 1e-12);
  });

  it('refuses a cutoff at or above Nyquist', () => {
    expect(() => lowPass([1, 2, 3], 100, 50)).toThrow(/below the Nyquist frequency/);
  });
});

describe('rippleMvPp', () => {
  // self-constructed example: three periods of an 8-point triangle around 5.004 V
  const triangle = Array.from({ length: 3 }, () => [5.004, 5.012, 5.02, 5.012, 5.004, 4.996, 4.988, 4.996]).flat();

  it('is max − min of the record', () => {
    // p-p = max − min = 5.020 − 4.988 V = 32.000 mV (hand arithmetic)
    close(rippleMvPp(triangle, 8e6), 32.0, 1e-9);
  });

  it('gives the peak-to-peak of a sampled sine', () => {
    // self-constructed example: a 40 mV p-p sine; with 64 samples per period the peaks are sampled exactly
    close(rippleMvPp(sine(192, 0.02, 500e3, 32e6, 5), 32e6), 40.0, 1e-9);
  });

  // 20 MHz bandwidth limit for switcher ripple: Powermate Technology, "What is output ripple and noise"
  it('with a 20 MHz limit keeps the switching ripple and drops 150 MHz pick-up', () => {
    const fs = 1e9;
    const ripple = sine(20000, 0.01, 500e3, fs, 5); // 20 mV p-p at 500 kHz, 10 periods
    const pickup = sine(20000, 0.015, 150e6, fs); // 30 mV p-p above the measurement bandwidth
    const record = ripple.map((v, i) => v + pickup[i]);
    expect(rippleMvPp(record, fs)).toBeGreaterThan(45);
    // the 150 MHz term is attenuated by the textbook gain (≈ 5.6e-4) and 500 kHz passes at ≈ 1
    expect(textbookGain(150e6, 20e6, fs)).toBeLessThan(1e-3);
    expect(Math.abs(rippleMvPp(record, fs, 20e6) - 20)).toBeLessThan(0.1);
  });

  it('applies no filter when the bandwidth is beyond the record’s Nyquist frequency', () => {
    expect(rippleMvPp(triangle, 8e6, 20e6)).toBe(rippleMvPp(triangle, 8e6));
  });

  it('refuses a record with a bad sample, naming it', () => {
    expect(() => rippleMvPp([5, 5.01, Number.POSITIVE_INFINITY], 1e6)).toThrow(/samplesV\[2\]/);
  });
});

describe('acRmsMv', () => {
  it('is the AC rms of the sampled triangle', () => {
    // self-constructed example, recomputed with simple-statistics standardDeviation: 9.797 959 mV (the continuous
    // triangle would be Vpp/(2√3) = 9.237 604 mV: do not mix them)
    close(acRmsMv([5.004, 5.012, 5.02, 5.012, 5.004, 4.996, 4.988, 4.996]), 9.797958971, 1e-9);
  });

  it('is Vpp/(2√2) for a sine sampled over whole periods', () => {
    // rms of a sine = Vpp/(2√2) (standard relation); 40 mV p-p → 14.142 136 mV
    close(acRmsMv(sine(192, 0.02, 500e3, 32e6, 5)), 14.14213562, 1e-9);
  });

  it('equals the population standard deviation from simple-statistics', () => {
    // npm reference library simple-statistics standardDeviation (population, n)
    const record = [5.001, 4.997, 5.006, 4.993, 5.0, 5.004, 4.999];
    close(acRmsMv(record), standardDeviation(record) * 1000, 1e-9);
  });
});
