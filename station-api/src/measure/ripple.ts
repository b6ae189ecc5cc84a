import { requireFiniteArray, requirePositive } from './guards';

/**
 * Ripple and noise (PARD) from a captured output-voltage record.
 *
 * Bandwidth limit: a bench measurement of switcher ripple is taken with the scope's 20 MHz bandwidth limit
 * (Powermate Technology, "What is output ripple and noise"; the PARD band of the Agilent E3614A manual, appendix A,
 * also ends at 20 MHz). The captured record is limited in software the same way before p-p is taken, with
 *
 *   a 2nd-order Butterworth low-pass, digitised by the bilinear transform with the cutoff pre-warped,
 *   run forward and then backward over the record (zero phase, so the filter does not shift the waveform).
 *
 * Running a filter twice squares its magnitude: a section designed for −3 dB at f_c would give −6 dB there.
 * The section's cutoff is therefore raised so that the *combined* two-pass response is −3 dB at the requested
 * bandwidth. With the bilinear transform, the digital response equals the analogue Butterworth response at the
 * warped frequency Ω = tan(π f / f_s) (Oppenheim & Schafer, Discrete-Time Signal Processing, the bilinear-
 * transformation section of the filter-design chapter; chapter recalled from memory), so the combined gain is exactly
 *
 *   |H(f)|² (two passes) = 1 / (1 + (tan(π f / f_s) / tan(π f_d / f_s))⁴)
 *
 * with tan(π f_d / f_s) = tan(π f_c / f_s) / (√2 − 1)^(1/4). The same correction for dual-pass Butterworth
 * filters is given in Winter, Biomechanics and Motor Control of Human Movement (the digital-filtering section;
 * recalled from memory, not checked against the book). The test checks the formula numerically, not the citation.
 *
 * Record ends: the record is extended at both ends by its mirror image (even reflection about the end sample)
 * before filtering, and the extension is dropped afterwards; the output has the input's length. The mirror keeps a
 * record that starts on a ripple peak from producing a start-up step, and, unlike the odd (point-symmetric)
 * extension some zero-phase implementations use, it does not pin the end samples to their raw value, so
 * out-of-band noise on the first or last sample is filtered like everywhere else.
 */

/** Coefficients of one normalised biquad section, y[n] = b0 x[n] + b1 x[n−1] + b2 x[n−2] − a1 y[n−1] − a2 y[n−2]. */
interface Biquad {
  b0: number;
  b1: number;
  b2: number;
  a1: number;
  a2: number;
}

/** Two passes of a 2nd-order section: (√2 − 1)^(1/(2·order)) with order 2. */
const TWO_PASS_CORRECTION = Math.pow(Math.SQRT2 - 1, 1 / 4);

function butterworth2(warpedK: number): Biquad {
  // Bilinear transform of H(s) = 1 / (s² + √2 s + 1) with s scaled by the pre-warped cutoff K = tan(π f_d / f_s)
  const k2 = warpedK * warpedK;
  const norm = 1 / (1 + Math.SQRT2 * warpedK + k2);
  const b0 = k2 * norm;
  return { b0, b1: 2 * b0, b2: b0, a1: 2 * (k2 - 1) * norm, a2: (1 - Math.SQRT2 * warpedK + k2) * norm };
}

/** One causal pass (transposed direct form II), state started as if the first value had always been present. */
function runBiquad(q: Biquad, x: Float64Array): Float64Array {
  const y = new Float64Array(x.length);
  const x0 = x[0];
  // steady state for a constant input x0 (the section has unity DC gain, so y = x0)
  let z1 = (1 - q.b0) * x0;
  let z2 = (q.b2 - q.a2) * x0;
  for (let n = 0; n < x.length; n++) {
    const xn = x[n];
    const yn = q.b0 * xn + z1;
    z1 = q.b1 * xn - q.a1 * yn + z2;
    z2 = q.b2 * xn - q.a2 * yn;
    y[n] = yn;
  }
  return y;
}

/**
 * Zero-phase low-pass: a 2nd-order Butterworth section run forward and backward, designed so that the
 * combined response is −3 dB at `cutoffHz` (see the module comment for the exact gain formula).
 * @param samples input record (any unit; the output has the same unit)
 * @param sampleRateHz sample rate of the record (Hz)
 * @param cutoffHz −3 dB frequency of the combined response (Hz); must be below the Nyquist frequency
 * @returns filtered record, same length as the input
 * @throws RangeError on non-finite samples, fewer than 2 samples, or a cutoff not in (0, f_s/2)
 */
export function lowPass(samples: number[], sampleRateHz: number, cutoffHz: number): number[] {
  requireFiniteArray('samples', samples, 2);
  requirePositive('sampleRateHz', sampleRateHz);
  requirePositive('cutoffHz', cutoffHz);
  if (cutoffHz >= sampleRateHz / 2) {
    throw new RangeError(
      `cutoffHz ${cutoffHz} Hz must be below the Nyquist frequency ${sampleRateHz / 2} Hz of a ${sampleRateHz} Hz record`,
    );
  }
  const q = butterworth2(Math.tan((Math.PI * cutoffHz) / sampleRateHz) / TWO_PASS_CORRECTION);
  const n = samples.length;
  // about three time constants of the section's impulse response, bounded by the record itself
  const pad = Math.min(n - 1, Math.max(6, Math.ceil((3 * sampleRateHz) / cutoffHz)));
  const ext = new Float64Array(n + 2 * pad);
  for (let i = 0; i < pad; i++) ext[i] = samples[pad - i];
  for (let i = 0; i < n; i++) ext[pad + i] = samples[i];
  for (let i = 0; i < pad; i++) ext[pad + n + i] = samples[n - 2 - i];
  const forward = runBiquad(q, ext);
  forward.reverse();
  const backward = runBiquad(q, forward);
  backward.reverse();
  return Array.from(backward.subarray(pad, pad + n));
}

/**
 * Peak-to-peak ripple of a record, optionally after the software bandwidth limit.
 * When `bandwidthHz` is at or above the record's Nyquist frequency, the sampling already limits the bandwidth
 * more than the requested limit would, so no filter is applied.
 * @param samplesV output-voltage record (V)
 * @param sampleRateHz sample rate (Hz)
 * @param bandwidthHz optional −3 dB bandwidth limit (Hz), e.g. 20e6 for PARD practice
 * @returns ripple in millivolts peak-to-peak
 */
export function rippleMvPp(samplesV: number[], sampleRateHz: number, bandwidthHz?: number): number {
  requireFiniteArray('samplesV', samplesV, 2);
  requirePositive('sampleRateHz', sampleRateHz);
  let v = samplesV;
  if (bandwidthHz !== undefined) {
    requirePositive('bandwidthHz', bandwidthHz);
    if (bandwidthHz < sampleRateHz / 2) v = lowPass(samplesV, sampleRateHz, bandwidthHz);
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (const x of v) {
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  return (hi - lo) * 1000;
}

/**
 * AC rms of a record: √(mean((v − mean v)²)), the population form (the record is the whole waveform,
 * not a sample from it).
 * @param samplesV record (V)
 * @returns AC rms in millivolts
 */
export function acRmsMv(samplesV: number[]): number {
  requireFiniteArray('samplesV', samplesV, 1);
  let sum = 0;
  for (const x of samplesV) sum += x;
  const mean = sum / samplesV.length;
  let ss = 0;
  for (const x of samplesV) ss += (x - mean) * (x - mean);
  return Math.sqrt(ss / samplesV.length) * 1000;
}
