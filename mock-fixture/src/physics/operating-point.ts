import { dcmCapacitiveRippleVpp, dimensionlessK, dcmDutyForRatio, inductorRippleApp, outputRippleVpp, switchingLossW } from './buck-relations';
import type { BuckDesign, UnitModel } from './model-types';

/** Ambient temperature the case-temperature estimate starts from, °C (IEC-style 25 °C reference). */
export const AMBIENT_C = 25;

/** What the fixture applies to the module. */
export interface OperatingConditions {
  /** Input source output enabled */
  sourceOn: boolean;
  /** Input source set voltage */
  vinV: number;
  /** Constant-current load demand; 0 when the load input is off */
  loadA: number;
}

export type ConversionMode = 'off' | 'undervoltage' | 'overvoltage' | 'ccm' | 'dcm' | 'dropout' | 'foldback';

/** Where the power goes, in watts. `totalW` is their sum. */
export interface LossBreakdown {
  quiescentW: number;
  switchConductionW: number;
  inductorW: number;
  rectifierW: number;
  switchingW: number;
  totalW: number;
}

/** The inductor current over one switching period, enough to rebuild the ripple waveform. */
export type InductorCurrentShape =
  | { kind: 'none' }
  | { kind: 'ccm'; duty: number; rippleApp: number }
  | { kind: 'dcm'; duty: number; freewheelDuty: number; peakA: number };

/** A steady state of the module and what a meter at its terminals would read (before meter noise). */
export interface OperatingPoint {
  mode: ConversionMode;
  vinV: number;
  iinA: number;
  /** Output voltage at the terminals (0 when the output is open) */
  voutV: number;
  ioutA: number;
  duty: number;
  /** Load below which the stage leaves CCM, for the present line and output */
  criticalLoadA: number;
  /** Peak-to-peak inductor ripple (CCM) or peak current (DCM) */
  inductorRippleApp: number;
  /** Ripple estimate ΔI·ESR + capacitive term (DCM form below the critical load) */
  outputRippleVpp: number;
  inductorCurrent: InductorCurrentShape;
  losses: LossBreakdown;
  /** P_out / P_in × 100 from the terminal figures; null when no power is delivered */
  efficiencyPct: number | null;
  caseTempC: number;
}

const ZERO_LOSSES: LossBreakdown = {
  quiescentW: 0,
  switchConductionW: 0,
  inductorW: 0,
  rectifierW: 0,
  switchingW: 0,
  totalW: 0,
};

function rectifierDropV(design: BuckDesign, currentA: number): number {
  return design.rectifier.kind === 'diode' ? design.rectifier.forwardDropV : currentA * design.rectifier.ronLowOhm;
}

/**
 * CCM duty cycle corrected for the resistive and rectifier drops, from volt-second balance on the inductor:
 * D·(V_in − I·R_on) − (1 − D)·V_r = V_out + I·R_L, so D = (V_out + I·R_L + V_r) / (V_in − I·R_on + V_r),
 * where V_r is the diode drop or I·R_on,low. With all drops zero it reduces to D = V_out/V_in.
 * @param vinV input voltage (V)
 * @param voutV output voltage (V)
 * @param currentA output (= average inductor) current (A)
 */
export function lossyCcmDuty(design: BuckDesign, vinV: number, voutV: number, currentA: number): number {
  const vr = rectifierDropV(design, currentA);
  return (voutV + currentA * design.inductorDcrOhm + vr) / (vinV - currentA * design.ronHighOhm + vr);
}

/**
 * The loss model. The switch conducts for the fraction `switchShare` of the period's current-carrying time
 * (D in CCM, D/(D + D2) in DCM) and the rectifier for the rest.
 *   quiescent  V_in·I_q
 *   switch     I²·R_on·share        inductor  I²·R_L
 *   rectifier  V_f·I·(1 − share) (diode)  or  I²·R_on,low·(1 − share) (synchronous)
 *   switching  k·V_in·I·f
 * DC current is used for the I² terms; the ripple's contribution (ΔI²/12) is left out as second order.
 * @returns losses in watts
 */
export function lossBreakdown(design: BuckDesign, vinV: number, currentA: number, switchShare: number): LossBreakdown {
  const quiescentW = vinV * design.quiescentA;
  const switchConductionW = currentA * currentA * design.ronHighOhm * switchShare;
  const inductorW = currentA * currentA * design.inductorDcrOhm;
  const rectifierW =
    design.rectifier.kind === 'diode'
      ? design.rectifier.forwardDropV * currentA * (1 - switchShare)
      : currentA * currentA * design.rectifier.ronLowOhm * (1 - switchShare);
  const switchingW = switchingLossW(design.switchingLossS, vinV, currentA, design.switchingHz);
  return {
    quiescentW,
    switchConductionW,
    inductorW,
    rectifierW,
    switchingW,
    totalW: quiescentW + switchConductionW + inductorW + rectifierW + switchingW,
  };
}

/** Power stage at a given output voltage and current: mode, duty, ripple and losses. */
interface StageState {
  mode: 'ccm' | 'dcm' | 'dropout';
  voutV: number;
  duty: number;
  switchShare: number;
  criticalLoadA: number;
  inductorRippleApp: number;
  outputRippleVpp: number;
  inductorCurrent: InductorCurrentShape;
}

function criticalLoadAt(design: BuckDesign, vinV: number, voutV: number, currentA: number): number {
  const duty = Math.min(design.maxDuty, lossyCcmDuty(design, vinV, voutV, currentA));
  return inductorRippleApp(vinV, voutV, duty, design.inductanceH, design.switchingHz) / 2;
}

function powerStage(design: BuckDesign, vinV: number, wantedVoutV: number, currentA: number): StageState {
  const { inductanceH: l, switchingHz: f, capacitanceF: c, esrOhm: esr } = design;
  let duty = lossyCcmDuty(design, vinV, wantedVoutV, currentA);
  let voutV = wantedVoutV;
  let mode: StageState['mode'] = 'ccm';
  if (duty > design.maxDuty) {
    // the controller runs out of duty: the output follows the input, less the drops
    duty = design.maxDuty;
    const vr = rectifierDropV(design, currentA);
    voutV = Math.max(0, duty * (vinV - currentA * design.ronHighOhm + vr) - currentA * design.inductorDcrOhm - vr);
    mode = 'dropout';
  }
  const ccmRippleApp = inductorRippleApp(vinV, voutV, duty, l, f);
  const criticalLoadA = ccmRippleApp / 2;
  if (mode === 'dropout' || currentA >= criticalLoadA) {
    return {
      mode,
      voutV,
      duty,
      switchShare: duty,
      criticalLoadA,
      inductorRippleApp: ccmRippleApp,
      outputRippleVpp: outputRippleVpp(ccmRippleApp, f, c, esr),
      inductorCurrent: { kind: 'ccm', duty, rippleApp: ccmRippleApp },
    };
  }
  if (currentA <= 0) {
    // no load: the controller skips pulses; nothing flows through the stage on average
    return {
      mode: 'dcm',
      voutV,
      duty: 0,
      switchShare: 0,
      criticalLoadA,
      inductorRippleApp: 0,
      outputRippleVpp: 0,
      inductorCurrent: { kind: 'none' },
    };
  }
  // DCM: the loop picks the duty that gives the wanted output (ideal-converter relations, since the
  // resistive drops at these small currents are negligible)
  const ratio = voutV / vinV;
  const k = dimensionlessK(l, voutV / currentA, f);
  const dcmDuty = dcmDutyForRatio(ratio, k);
  const freewheelDuty = (dcmDuty * (vinV - voutV)) / voutV;
  const peakA = ((vinV - voutV) * dcmDuty) / (l * f);
  return {
    mode: 'dcm',
    voutV,
    duty: dcmDuty,
    switchShare: dcmDuty / (dcmDuty + freewheelDuty),
    criticalLoadA,
    inductorRippleApp: peakA,
    outputRippleVpp: peakA * esr + dcmCapacitiveRippleVpp(peakA, currentA, (dcmDuty + freewheelDuty) / f, c),
    inductorCurrent: { kind: 'dcm', duty: dcmDuty, freewheelDuty, peakA },
  };
}

function idlePoint(mode: ConversionMode, vinV: number, iinA: number): OperatingPoint {
  const losses = { ...ZERO_LOSSES, quiescentW: vinV * iinA, totalW: vinV * iinA };
  return {
    mode,
    vinV,
    iinA,
    voutV: 0,
    ioutA: 0,
    duty: 0,
    criticalLoadA: 0,
    inductorRippleApp: 0,
    outputRippleVpp: 0,
    inductorCurrent: { kind: 'none' },
    losses,
    efficiencyPct: null,
    caseTempC: AMBIENT_C,
  };
}

/**
 * Solve the steady state of one unit under the fixture's conditions. Efficiency is not a parameter: it
 * follows from P_in = V_out·I_out + losses, with I_in = P_in / V_in.
 */
export function solveOperatingPoint(unit: UnitModel, conditions: OperatingConditions): OperatingPoint {
  const d = unit.design;
  const vinV = conditions.vinV;
  if (!conditions.sourceOn || vinV <= 0) return idlePoint('off', 0, 0);
  // below UVLO or above OVLO only the lock-out comparator runs (a tenth of I_q; common practice, no source)
  if (vinV < d.uvloV) return idlePoint('undervoltage', vinV, d.quiescentA * 0.1);
  if (vinV > d.ovloV) return idlePoint('overvoltage', vinV, d.quiescentA * 0.1);

  const demandA = Math.max(0, conditions.loadA);
  // with the output pins open the converter runs unloaded and the terminals see nothing
  const loadA = unit.outputOpen ? 0 : demandA;

  let mode: ConversionMode;
  let stage: StageState;
  let ioutA = loadA;
  if (loadA > d.currentLimitA && !unit.noProtection) {
    ioutA = Math.min(loadA, d.foldbackCurrentFraction * d.currentLimitA);
    stage = powerStage(d, vinV, d.foldbackVoutFraction * unit.setPointV, ioutA);
    mode = 'foldback';
  } else {
    let targetV =
      unit.setPointV * (1 + (d.lineRegulationPctPerV / 100) * (vinV - unit.ratings.vinNomV)) -
      d.outputResistanceOhm * loadA;
    if (loadA > d.currentLimitA) {
      // unprotected overload: the loop saturates on the switch current and the output sags by 10 % of the
      // set point per limit's worth of excess current (modelling choice, no source)
      targetV -= ((loadA - d.currentLimitA) / d.currentLimitA) * 0.1 * unit.setPointV;
    }
    const criticalA = criticalLoadAt(d, vinV, targetV, loadA);
    if (loadA < criticalA) {
      // light load: the loop's static error grows as the modulator gain falls in DCM, so the output rises
      // towards +dcmRisePct at zero load (modelling choice, no source)
      targetV += unit.setPointV * (d.dcmRisePct / 100) * (1 - loadA / criticalA);
    }
    stage = powerStage(d, vinV, targetV, loadA);
    mode = stage.mode;
  }

  const losses = lossBreakdown(d, vinV, ioutA, stage.switchShare);
  const outputW = stage.voutV * ioutA;
  const inputW = outputW + losses.totalW;
  return {
    mode,
    vinV,
    iinA: inputW / vinV,
    voutV: unit.outputOpen ? 0 : stage.voutV,
    ioutA,
    duty: stage.duty,
    criticalLoadA: stage.criticalLoadA,
    inductorRippleApp: stage.inductorRippleApp,
    outputRippleVpp: unit.outputOpen ? 0 : stage.outputRippleVpp,
    inductorCurrent: stage.inductorCurrent,
    losses,
    efficiencyPct: outputW > 0 ? (100 * outputW) / inputW : null,
    caseTempC: AMBIENT_C + d.thermalResistanceCPerW * losses.totalW,
  };
}
