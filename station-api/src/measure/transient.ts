import { requireFinite, requireFiniteArray, requirePositive } from './guards';

/**
 * Load-step (transient) response from a captured output-voltage record.
 *
 * Conventions (ours; the recovery definitions follow Duke University's power converter testing notes and the NI
 * PXIe-4051 help, see docs/reference.md):
 * - Time 0 is the step instant, the sample at `stepIndex`; sample i is at (i − stepIndex) / f_s.
 * - V_before is the mean of the `preSamples` samples ending at and including the step sample (all samples up to
 *   the step by default). V_final is the mean of the last `finalSamples` samples (default: the last 10 % of the
 *   samples after the step, at least one).
 * - V_min and V_max are taken from the step sample to the end of the record.
 * - Undershoot = V_before − V_min, overshoot = V_max − V_before, both referenced to V_before (some
 *   specifications reference V_final instead; `vFinalV` is returned so a caller can form that). A deviation in
 *   the other direction is reported as 0, not as a negative figure.
 * - The band is V_nom × (1 ± bandPct/100), bounds inclusive (a sample on the bound is inside).
 * - `leftBandAtUs`: when the output first leaves the band after the step, interpolated linearly between the last
 *   in-band and first out-of-band samples; 0 when it is already out at the step; null when it never leaves.
 * - `recoveryUs`: the moment, measured from the step instant, at which the output re-enters the band after its
 *   last excursion and stays inside to the end of the record, interpolated linearly on the bound it crosses.
 *   0 when it never leaves; null when it is still outside at the end of the record (never recovers).
 * - `recoveryFromExitUs` = recoveryUs − leftBandAtUs: the "leaves the band → re-enters and stays" recovery time
 *   of the Duke University power-converter test notes; null when either end is missing, 0 when it never leaves.
 */

export interface TransientInput {
  /** Output-voltage record (V) */
  samplesV: number[];
  /** Sample rate (Hz) */
  sampleRateHz: number;
  /** Index of the sample at the step instant */
  stepIndex: number;
  /** Nominal output voltage, centre of the recovery band (V) */
  vNomV: number;
  /** Half-width of the recovery band in percent of V_nom */
  bandPct: number;
  /** Samples averaged for V_before, ending at the step sample */
  preSamples?: number;
  /** Samples at the end of the record averaged for V_final */
  finalSamples?: number;
}

export interface TransientMetrics {
  vBeforeV: number;
  vFinalV: number;
  vMinV: number;
  vMaxV: number;
  undershootMv: number;
  overshootMv: number;
  /** µs from the step instant to the final re-entry into the band; null if it never recovers */
  recoveryUs: number | null;
  /** µs from the step instant to the first exit from the band; null if it never leaves */
  leftBandAtUs: number | null;
  /** recoveryUs − leftBandAtUs (µs); null if it never recovers */
  recoveryFromExitUs: number | null;
}

/** Absorbs decimal-to-binary rounding of the band edges (1 nV per volt), so a sample written on a bound counts as on it. */
const BOUND_EPSILON = 1e-9;

function meanOf(xs: number[], from: number, to: number): number {
  let s = 0;
  for (let i = from; i < to; i++) s += xs[i];
  return s / (to - from);
}

function positiveInteger(name: string, x: number, max: number): void {
  if (!Number.isInteger(x) || x < 1 || x > max) {
    throw new RangeError(`${name} must be a whole number from 1 to ${max}, got ${String(x)}`);
  }
}

/**
 * Undershoot, overshoot and recovery of a load-step record; see the module comment for the conventions.
 * @returns voltages in V, deviations in mV, times in µs from the step instant
 * @throws RangeError on non-finite samples, a step index outside the record, or non-positive rate/band
 */
export function transientMetrics(input: TransientInput): TransientMetrics {
  const { samplesV, sampleRateHz, stepIndex, vNomV, bandPct } = input;
  requireFiniteArray('samplesV', samplesV, 2);
  requirePositive('sampleRateHz', sampleRateHz);
  requirePositive('vNomV', vNomV);
  requirePositive('bandPct', bandPct);
  const n = samplesV.length;
  if (!Number.isInteger(stepIndex) || stepIndex < 0 || stepIndex >= n - 1) {
    throw new RangeError(`stepIndex must be a whole number from 0 to ${n - 2} for a record of ${n} samples, got ${String(stepIndex)}`);
  }
  const preSamples = input.preSamples ?? stepIndex + 1;
  positiveInteger('preSamples', preSamples, stepIndex + 1);
  const after = n - 1 - stepIndex;
  const finalSamples = input.finalSamples ?? Math.max(1, Math.floor(after / 10));
  positiveInteger('finalSamples', finalSamples, after);

  const vBeforeV = meanOf(samplesV, stepIndex + 1 - preSamples, stepIndex + 1);
  const vFinalV = meanOf(samplesV, n - finalSamples, n);
  let vMinV = Infinity;
  let vMaxV = -Infinity;
  for (let i = stepIndex; i < n; i++) {
    vMinV = Math.min(vMinV, samplesV[i]);
    vMaxV = Math.max(vMaxV, samplesV[i]);
  }

  const lowV = vNomV * (1 - bandPct / 100);
  const highV = vNomV * (1 + bandPct / 100);
  requireFinite('band', lowV);
  const tol = BOUND_EPSILON * vNomV;
  const isOut = (v: number): boolean => v < lowV - tol || v > highV + tol;
  const usPerSample = 1e6 / sampleRateHz;
  const tUs = (i: number): number => (i - stepIndex) * usPerSample;
  /** Linear interpolation of the time the segment i → i+1 crosses `boundV`. */
  const crossing = (i: number, boundV: number): number => {
    const dv = samplesV[i + 1] - samplesV[i];
    const frac = dv === 0 ? 0 : (boundV - samplesV[i]) / dv;
    return tUs(i) + Math.min(1, Math.max(0, frac)) * usPerSample;
  };

  let firstOut = -1;
  let lastOut = -1;
  for (let i = stepIndex; i < n; i++) {
    if (isOut(samplesV[i])) {
      if (firstOut < 0) firstOut = i;
      lastOut = i;
    }
  }

  let leftBandAtUs: number | null = null;
  let recoveryUs: number | null = 0;
  if (firstOut >= 0) {
    if (firstOut === stepIndex) {
      leftBandAtUs = 0;
    } else {
      const v = samplesV[firstOut];
      leftBandAtUs = crossing(firstOut - 1, v < lowV ? lowV : highV);
    }
    if (lastOut === n - 1) {
      recoveryUs = null;
    } else {
      const v = samplesV[lastOut];
      recoveryUs = crossing(lastOut, v < lowV ? lowV : highV);
    }
  }
  const recoveryFromExitUs =
    recoveryUs === null ? null : leftBandAtUs === null ? 0 : Math.max(0, recoveryUs - leftBandAtUs);

  return {
    vBeforeV,
    vFinalV,
    vMinV,
    vMaxV,
    undershootMv: Math.max(0, (vBeforeV - vMinV) * 1000),
    overshootMv: Math.max(0, (vMaxV - vBeforeV) * 1000),
    recoveryUs,
    leftBandAtUs,
    recoveryFromExitUs,
  };
}
