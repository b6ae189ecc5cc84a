import { loadStepVoltageV, type LoadStepParams } from './load-step';
import type { UnitModel } from './model-types';
import { solveOperatingPoint, type OperatingPoint } from './operating-point';
import type { RandomStream } from './prng';
import { rippleWaveform, type RippleWaveform } from './ripple-waveform';

/** Fraction of the record before a load step (the step comes after sample floor(0.2·n), 0-based). */
export const STEP_POSITION = 0.2;

/** What the capture needs to know about the fixture state. */
export interface CaptureRequest {
  unit: UnitModel | null;
  sourceOn: boolean;
  vinV: number;
  /** Static load when no step is armed (0 with the load off) */
  loadA: number;
  /** Armed load step, or null */
  step: { fromA: number; toA: number } | null;
  rateHz: number;
  points: number;
  /** RMS noise of the capture channel, V */
  noiseVrms: number;
  rng: RandomStream;
}

/** Index of the last sample before the load step. */
export function stepIndexFor(points: number): number {
  return Math.floor(points * STEP_POSITION);
}

function waveformFor(unit: UnitModel, op: OperatingPoint): RippleWaveform {
  if (unit.outputOpen) return { at: () => 0, vppV: 0 };
  return rippleWaveform(op.inductorCurrent, op.ioutA, unit.design.switchingHz, unit.design.capacitanceF, unit.design.esrOhm);
}

/**
 * Sample the module's output voltage at `rateHz`: the DC level, the switching ripple evaluated at each
 * sample instant (so a low sample rate aliases it, as a real digitiser would), the load-step transient
 * when a step is armed, and gaussian channel noise. Returns volts, one per sample.
 */
export function captureOutputRecord(req: CaptureRequest): number[] {
  const { unit, rateHz, points, rng } = req;
  const noise = (): number => req.noiseVrms * rng.normal();
  if (!unit || !req.sourceOn) return Array.from({ length: points }, noise);

  const conditions = (loadA: number) => ({ sourceOn: req.sourceOn, vinV: req.vinV, loadA });
  const before = solveOperatingPoint(unit, conditions(req.step ? req.step.fromA : req.loadA));
  const after = req.step ? solveOperatingPoint(unit, conditions(req.step.toA)) : before;
  const rippleBefore = waveformFor(unit, before);
  const rippleAfter = req.step ? waveformFor(unit, after) : rippleBefore;
  // the digitiser is not synchronised to the switching clock
  const phaseS = rng.uniform() / unit.design.switchingHz;
  const stepIndex = stepIndexFor(points);

  let stepParams: LoadStepParams | null = null;
  if (req.step && !unit.outputOpen) {
    const deltaA = after.ioutA - before.ioutA;
    const inductorVoltageV = deltaA >= 0 ? req.vinV - before.voutV : before.voutV;
    stepParams = {
      vBeforeV: before.voutV,
      vAfterV: after.voutV,
      deltaA,
      naturalHz: unit.design.loopNaturalHz,
      damping: unit.design.loopDamping,
      capacitanceF: unit.design.capacitanceF,
      esrOhm: unit.design.esrOhm,
      slewS: inductorVoltageV > 0 ? (unit.design.inductanceH * Math.abs(deltaA)) / inductorVoltageV : 0,
    };
  }

  const record = new Array<number>(points);
  for (let n = 0; n < points; n++) {
    const tS = n / rateHz + phaseS;
    const afterStep = req.step !== null && n > stepIndex;
    let dcV: number;
    if (stepParams) dcV = loadStepVoltageV((n - stepIndex) / rateHz, stepParams);
    else dcV = afterStep ? after.voutV : before.voutV;
    const rippleV = (afterStep ? rippleAfter : rippleBefore).at(tS);
    record[n] = dcV + rippleV + noise();
  }
  return record;
}
