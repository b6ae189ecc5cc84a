import type { InductorCurrentShape } from './operating-point';

/** The output ripple over one switching period, as a function of time. */
export interface RippleWaveform {
  /** Deviation from the DC output (V) at time tS; periodic in 1/f, zero mean over a period */
  at(tS: number): number;
  /** Peak-to-peak of the waveform (V), exact */
  vppV: number;
}

interface Segment {
  startS: number;
  endS: number;
  /** capacitor current at the start of the segment and its slope (A, A/s) */
  startA: number;
  slopeAps: number;
  /** capacitor voltage at the start of the segment, before the mean is removed (V) */
  startV: number;
}

/**
 * Build the steady-state output ripple from the inductor current shape. The capacitor carries
 * i_C = i_L − I_out; its voltage is the integral of i_C / C (piecewise parabolic) and the ESR adds
 * ESR·i_C (piecewise linear). The equivalent series inductance and switching spikes are left out.
 * @param shape inductor current over one period
 * @param loadA DC output current (A)
 * @param switchingHz switching frequency (Hz)
 * @param capacitanceF output capacitance (F)
 * @param esrOhm capacitor ESR (Ω)
 */
export function rippleWaveform(
  shape: InductorCurrentShape,
  loadA: number,
  switchingHz: number,
  capacitanceF: number,
  esrOhm: number,
): RippleWaveform {
  const periodS = 1 / switchingHz;
  // corners of i_L(t) over one period, as [time, current]
  let corners: Array<[number, number]>;
  if (shape.kind === 'none') {
    return { at: () => 0, vppV: 0 };
  } else if (shape.kind === 'ccm') {
    const lowA = loadA - shape.rippleApp / 2;
    const highA = loadA + shape.rippleApp / 2;
    corners = [
      [0, lowA],
      [shape.duty * periodS, highA],
      [periodS, lowA],
    ];
  } else {
    const onEndS = shape.duty * periodS;
    const offEndS = Math.min(periodS, (shape.duty + shape.freewheelDuty) * periodS);
    corners = [
      [0, 0],
      [onEndS, shape.peakA],
      [offEndS, 0],
      [periodS, 0],
    ];
  }

  const segments: Segment[] = [];
  let vC = 0;
  for (let i = 0; i + 1 < corners.length; i++) {
    const [t0, i0] = corners[i];
    const [t1, i1] = corners[i + 1];
    const spanS = t1 - t0;
    if (spanS <= 0) continue;
    const startA = i0 - loadA;
    const slopeAps = (i1 - i0) / spanS;
    segments.push({ startS: t0, endS: t1, startA, slopeAps, startV: vC });
    vC += (startA * spanS + (slopeAps * spanS * spanS) / 2) / capacitanceF;
  }

  const valueIn = (seg: Segment, tau: number): number => {
    const iC = seg.startA + seg.slopeAps * tau;
    const capV = seg.startV + (seg.startA * tau + (seg.slopeAps * tau * tau) / 2) / capacitanceF;
    return capV + esrOhm * iC;
  };
  const raw = (tS: number): number => {
    const phaseS = ((tS % periodS) + periodS) % periodS;
    const seg = segments.find((s) => phaseS < s.endS) ?? segments[segments.length - 1];
    return valueIn(seg, phaseS - seg.startS);
  };

  // exact mean and extremes: per segment the integral is closed-form, and v(t) has its extremes at the
  // segment ends or where dv/dt = i_C/C + ESR·slope = 0
  let areaVs = 0;
  let min = Infinity;
  let max = -Infinity;
  for (const seg of segments) {
    const span = seg.endS - seg.startS;
    const a = seg.startA;
    const b = seg.slopeAps;
    areaVs += seg.startV * span + ((a * span * span) / 2 + (b * span ** 3) / 6) / capacitanceF + esrOhm * (a * span + (b * span * span) / 2);
    const candidates = [seg.startS, seg.endS];
    if (b !== 0) {
      const tau = (-esrOhm * capacitanceF * b - a) / b;
      if (tau > 0 && tau < span) candidates.push(seg.startS + tau);
    }
    for (const t of candidates) {
      const v = valueIn(seg, Math.min(t, seg.endS) - seg.startS);
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  const meanV = areaVs / periodS;
  return { at: (tS) => raw(tS) - meanV, vppV: max - min };
}
